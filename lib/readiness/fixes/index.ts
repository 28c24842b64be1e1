/** Fix proposals and the byte-faithful corrected file (lib/readiness/CHECKS.md, "Fix proposals"). */
export {
  FIX_CODES,
  isFixCode,
  type FixCode,
  type FixProposal,
  type FixRule,
  type FixExample,
  type FixChange,
} from "./types";
export {
  proposeFixes,
  withProposals,
  fixTally,
  tallyFixes,
  type ProposeOptions,
  type FixTally,
  type TallyOptions,
  type ConfirmedSentinel,
} from "./propose";
export { applyFixes, applyFixesToBytes, type AppliedFixes, type ApplyOptions } from "./rewrite";
export { changeLogCsv, selectProposals } from "./log";
export { csvCell, formulaSafe } from "./csv-cell";
