/** What scripts/load/setup.ts hands to the load script: the study and who sends and reads. */
export const LOAD_STUDY_SLUG = "load-barley";

export interface LoadAccounts {
  studySlug: string;
  providers: { email: string; organisation: string; token: string }[];
  analysts: { email: string; token: string }[];
  leads: { email: string; token: string }[];
  /** every load account's password (for the sign-in checks) */
  password: string;
}
