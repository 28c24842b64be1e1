/**
 * The studies feature: studies, their data plans and their members. Reads scoped to the user
 * (queries*.ts, scope.ts — which also scopes batches), writes with audit rows (commands-*.ts,
 * through lib/core/write.ts), zod schemas (schemas.ts) and the model size (model-size.ts),
 * both also used in the browser. Other features and the app's server code import from here.
 */
export { createStudy, updateStudy, type StudyRecord } from "./commands-studies";
export { publishPlanVersion, planFieldErrors, type PublishedPlan } from "./commands-plans";
export {
  assignAnalyst,
  unassignAnalyst,
  admitProvider,
  removeProvider,
  type Membership,
} from "./commands-members";
export { getStudyForUser, listStudiesForUser, type StudyDetail, type StudySummary } from "./queries-detail";
export {
  getCurrentPlanForUser,
  listMembershipCandidates,
  listPlanVersionsForUser,
  listStudyRowsForUser,
  listTeamOrganisations,
  type CurrentPlan,
  type Option,
  type PlanVersionRow,
  type StudyListRow,
} from "./queries";
export { batchScope, studyScope } from "./scope";
export { modelSize, type ModelSize, type ModelTerm } from "./model-size";
