/**
 * The people feature: users and their organisations, invitations and password links, API
 * tokens, the audit trail. Reads in queries*.ts, writes in commands-*.ts (through
 * lib/core/write.ts), zod schemas in schemas.ts (also used by the browser's forms). Sign-in,
 * sessions and the role → actions table are lib/auth/, which every feature uses.
 */
export {
  describeLink,
  issueUserLink,
  requestPasswordReset,
  setPasswordWithLink,
  type LinkInfo,
} from "./commands-links";
export { createApiToken, revokeApiToken } from "./commands-tokens";
export {
  changeOwnPassword,
  changeRole,
  createUser,
  setActive,
  updateUser,
  type UserRecord,
} from "./commands-users";
export {
  getUserForAdmin,
  listApiTokens,
  listUsers,
  type ApiTokenListItem,
  type UserListItem,
} from "./queries";
export { listAuditEvents, type AuditEventItem, type AuditFilter } from "./queries-audit";
export { listOrganisations, type OrganisationListItem } from "./queries-organisations";
