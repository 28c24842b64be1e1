/** The invented demo scenario: organisations, sign-ins, studies and their data plans. */
export * from "./accounts";
export * from "./plans";
export * from "./studies";
export { canonicalJson, planHash } from "./plan-hash";
