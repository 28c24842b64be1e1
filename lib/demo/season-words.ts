/** What the season's analysts write when they bounce a file, by its defect (invented), and the plan's mid-season change. */
import type { PlanInput } from "@/lib/readiness";
import type { Defect } from "./season-files";

export const BOUNCE_WORDS: Record<Defect, { comment: string; finding: string }> = {
  clean: {
    comment: "Please send this batch again; see the comment on the finding.",
    finding: "Check this against the data plan and send a corrected file.",
  },
  commas: {
    comment: "Please send this batch again; see the comment on the finding.",
    finding: "Check this against the data plan and send a corrected file.",
  },
  variants: {
    comment: "Nearly there: the soil levels are spelt several ways. Fix them and send the batch again.",
    finding: "Write each soil level exactly as the plan lists it: lower case, no trailing space.",
  },
  collinear: {
    comment: "total_water_mm is irrigation plus rainfall here, so the model cannot tell them apart.",
    finding: "Send the plot gauge reading in total_water_mm, not the sum of the other two columns.",
  },
  missing: {
    comment:
      "Too many readings are missing for the model to use these rows. Fill them in from the field records and send again.",
    finding:
      "Fill in these values from your records; leave a cell empty only when it was truly not measured.",
  },
  few: {
    comment:
      "Thank you — this is too few rows for the model on its own. Add the rest of the season's rows and send it as a new version.",
    finding: "Add the remaining rows of the season to this batch.",
  },
  sentinel: {
    comment: "-999 is read as a number, not as 'not counted'. Leave those cells empty and send again.",
    finding: "Leave the cell empty where the value was not counted; -999 enters the model as a real value.",
  },
  range: {
    comment: "Some floor areas look like square feet. Convert them to square metres and send again.",
    finding: "Floor area is in square metres (divide square feet by 10.764).",
  },
};

/** The barley plan as the lead republishes it mid-season: the same columns, a larger df target. */
export function republishedBarley(plan: PlanInput): PlanInput {
  return { ...plan, thresholds: { ...plan.thresholds, dfTarget: 1000 } };
}
