/**
 * The report's missingness map (components/report/report-pictures.tsx) when the engine kept no
 * patterns because there were more than its limit (REPORT-FORMAT.md, `patternsOverflow`): it
 * says the gaps are scattered, never that nothing is missing.
 */
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, test } from "vitest";
import { MissingnessMap } from "@/components/report/report-pictures";

describe("the missingness map", () => {
  test("past the pattern limit: scattered gaps, not 'no missing values'", () => {
    const html = renderToStaticMarkup(
      createElement(MissingnessMap, {
        patterns: [],
        columns: ["y", "v0"],
        total: 44_000,
        overflow: { limit: 39_603 },
      }),
    );
    expect(html).toContain("more than 39,603 different combinations of missing columns");
    expect(html).not.toContain("No missing values");
  });

  test("no patterns and no overflow: nothing is missing", () => {
    const html = renderToStaticMarkup(
      createElement(MissingnessMap, { patterns: [], columns: ["y"], total: 10 }),
    );
    expect(html).toContain("No missing values in the planned columns.");
  });
});
