/**
 * The demo's organisations and sign-ins (invented). README.md "Using Tributary, role by role" lists the same accounts;
 * every password is DEMO_PASSWORD.
 */
import type { UserRole } from "@/db/schema";

export const DEMO_PASSWORD = "tributary-demo";

export interface DemoOrganisation {
  slug: string;
  name: string;
  kind: "provider" | "team";
}

export const DEMO_TEAM_SLUG = "lowmoor";
export const DEMO_AGENCY_SLUG = "marlow-vale";

export const DEMO_FARMS: readonly DemoOrganisation[] = [
  { slug: "harrowgate", name: "Harrowgate Farm", kind: "provider" },
  { slug: "fennick-hill", name: "Fennick Hill Farm", kind: "provider" },
  { slug: "brackenridge", name: "Brackenridge Farm", kind: "provider" },
  { slug: "hollinsfold", name: "Hollinsfold Farm", kind: "provider" },
  { slug: "saltmarsh-end", name: "Saltmarsh End Farm", kind: "provider" },
  { slug: "coldwell", name: "Coldwell Farm", kind: "provider" },
];

export const DEMO_INSTALLERS: readonly DemoOrganisation[] = [
  { slug: "greenhearth", name: "Greenhearth Installers", kind: "provider" },
  { slug: "tarnbrook-heating", name: "Tarnbrook Heating Co-operative", kind: "provider" },
];

export const DEMO_ORGANISATIONS: readonly DemoOrganisation[] = [
  { slug: DEMO_TEAM_SLUG, name: "Lowmoor Valley Crop Trials", kind: "team" },
  { slug: DEMO_AGENCY_SLUG, name: "Marlow Vale Energy Agency", kind: "team" },
  ...DEMO_FARMS,
  ...DEMO_INSTALLERS,
];

export interface DemoUser {
  email: string;
  name: string;
  role: UserRole;
  organisationSlug: string;
  active: boolean;
  /** what the account is for, shown in the sign-ins table */
  note: string;
}

export const DEMO_USERS: readonly DemoUser[] = [
  {
    email: "admin@tributary.test",
    name: "Morwenna Tate",
    role: "admin",
    organisationSlug: DEMO_TEAM_SLUG,
    active: true,
    note: "users, studies, data plans",
  },
  {
    email: "lead@lowmoor.test",
    name: "Rhiannon Avery",
    role: "lead",
    organisationSlug: DEMO_TEAM_SLUG,
    active: true,
    note: "status board of the team's studies",
  },
  {
    email: "analyst@lowmoor.test",
    name: "Tobias Ferrell",
    role: "analyst",
    organisationSlug: DEMO_TEAM_SLUG,
    active: true,
    note: "reviews barley-nitrogen",
  },
  {
    email: "analyst2@lowmoor.test",
    name: "Imogen Hale",
    role: "analyst",
    organisationSlug: DEMO_TEAM_SLUG,
    active: true,
    note: "reviews heat-pump-savings only",
  },
  {
    email: "provider@harrowgate.test",
    name: "Gareth Lund",
    role: "provider",
    organisationSlug: "harrowgate",
    active: true,
    note: "uploads for Harrowgate Farm",
  },
  {
    email: "provider@fennick.test",
    name: "Esther Quayle",
    role: "provider",
    organisationSlug: "fennick-hill",
    active: true,
    note: "uploads for Fennick Hill Farm",
  },
  {
    email: "installer@greenhearth.test",
    name: "Callum Reyes",
    role: "provider",
    organisationSlug: "greenhearth",
    active: true,
    note: "uploads for Greenhearth Installers",
  },
  {
    email: "provider@brackenridge.test",
    name: "Ailsa Morrow",
    role: "provider",
    organisationSlug: "brackenridge",
    active: true,
    note: "uploads for Brackenridge Farm",
  },
  {
    email: "provider@hollinsfold.test",
    name: "Hamish Teale",
    role: "provider",
    organisationSlug: "hollinsfold",
    active: true,
    note: "uploads for Hollinsfold Farm",
  },
  {
    email: "provider@saltmarsh.test",
    name: "Priya Danes",
    role: "provider",
    organisationSlug: "saltmarsh-end",
    active: true,
    note: "uploads for Saltmarsh End Farm",
  },
  {
    email: "provider@coldwell.test",
    name: "Owen Pritchard",
    role: "provider",
    organisationSlug: "coldwell",
    active: true,
    note: "uploads for Coldwell Farm",
  },
  {
    email: "inactive@harrowgate.test",
    name: "Dennis Otway",
    role: "provider",
    organisationSlug: "harrowgate",
    active: false,
    note: "deactivated: cannot sign in",
  },
];
