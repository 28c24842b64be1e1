/**
 * A numeric column's summary in the report's columns table (components/report/box-plot.tsx):
 * quartiles the engine found from a bounded sample (REPORT-FORMAT.md, `quartiles: "sample"`)
 * read "≈" and say where they come from; exact ones are shown as they are.
 */
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, test } from "vitest";
import { SAMPLED_QUARTILES, SummaryText } from "@/components/report/box-plot";

const s = { min: 1, q1: 2.5, median: 4, q3: 6.25, max: 9, mean: 4.2, sd: 2.1 };

describe("the summary of a numeric column", () => {
  test("sampled quartiles read ≈ and say they come from a sample, min and max do not", () => {
    const html = renderToStaticMarkup(createElement(SummaryText, { s, sampled: true }));
    expect(html).toContain("≈2.5");
    expect(html).toContain("≈4");
    expect(html).toContain("≈6.25");
    expect(html).not.toContain("≈1");
    expect(html).not.toContain("≈9");
    expect(html).toContain(`title="median, ${SAMPLED_QUARTILES.replace(/'/g, "&#x27;")}"`);
    expect(html).toContain("(quartiles and median from a uniform sample");
  });

  test("exact quartiles are shown as they are", () => {
    const html = renderToStaticMarkup(createElement(SummaryText, { s }));
    expect(html).not.toContain("≈");
    expect(html).not.toContain("sample");
    expect(html).toContain('title="median"');
  });
});
