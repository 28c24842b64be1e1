// Studies, their data plans and their members: services (mutations with audit rows) and reads.
export { createStudy, updateStudy, type StudyRecord } from "./commands-studies";
export { publishPlanVersion, planFieldErrors, type PublishedPlan } from "./commands-plans";
export { assignAnalyst, unassignAnalyst, admitProvider, removeProvider, type Membership } from "./commands-members";
