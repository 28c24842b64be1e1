/** The two demo studies, who runs them, who reviews them and who sends them batches (invented). */
import type { PlanInput } from "@/lib/readiness";
import { DEMO_AGENCY_SLUG, DEMO_FARMS, DEMO_INSTALLERS, DEMO_TEAM_SLUG } from "./accounts";
import { BARLEY_PLAN, HEAT_PUMP_PLAN } from "./plans";

export interface DemoStudy {
  slug: string;
  title: string;
  description: string;
  teamSlug: string;
  /** who created the study and its first plan */
  createdByEmail: string;
  plan: PlanInput;
  planNote: string;
  analystEmails: readonly string[];
  providerSlugs: readonly string[];
}

export const DEMO_STUDIES: readonly DemoStudy[] = [
  {
    slug: "barley-nitrogen",
    title: "Spring barley nitrogen response",
    description:
      "Plot-level results from the six partner farms of the Lowmoor Valley network. The model: grain yield on nitrogen rate, irrigation, rainfall, soil texture, variety, sowing day, plant density and soil organic matter.",
    teamSlug: DEMO_TEAM_SLUG,
    createdByEmail: "lead@lowmoor.test",
    plan: BARLEY_PLAN,
    planNote: "first plan, agreed with the partner farms before the season",
    analystEmails: ["analyst@lowmoor.test"],
    providerSlugs: DEMO_FARMS.map((f) => f.slug),
  },
  {
    slug: "heat-pump-savings",
    title: "Heat-pump retrofit savings",
    description:
      "Homes retrofitted under the Marlow Vale Energy Agency scheme. The model: first-year energy saved on floor area, prior consumption, heat-pump type, insulation, building age, household size and occupancy.",
    teamSlug: DEMO_AGENCY_SLUG,
    createdByEmail: "admin@tributary.test",
    plan: HEAT_PUMP_PLAN,
    planNote: "first plan, from the agency's evaluation protocol",
    analystEmails: ["analyst2@lowmoor.test"],
    providerSlugs: DEMO_INSTALLERS.map((i) => i.slug),
  },
];
