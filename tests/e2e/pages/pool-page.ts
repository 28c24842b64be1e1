import { expect, type Locator, type Page } from "@playwright/test";

/** /pool/<slug>: the pool's figures and its three questions, read from what the worker stored. */
export class PoolPage {
  readonly status: Locator;
  readonly poolability: Locator;
  readonly findings: Locator;
  readonly influence: Locator;
  readonly criteria: Locator;
  readonly cvCurve: Locator;
  readonly caution: Locator;
  readonly overall: Locator;

  constructor(readonly page: Page) {
    this.status = page.getByTestId("questions-status").first();
    // react-table-library renders its tables with the grid role
    this.poolability = page.getByRole("grid", { name: "Poolability of each batch and provider" });
    this.findings = page.getByRole("grid", { name: "Findings on poolability and influence" });
    this.influence = page.getByTestId("influence-chart");
    this.criteria = page.getByTestId("criteria-chart");
    this.cvCurve = page.getByTestId("cv-curve");
    this.caution = page.getByTestId("selection-caution");
    this.overall = page.getByTestId("overall-test");
  }

  async goto(slug: string): Promise<void> {
    await this.page.goto(`/pool/${slug}`);
    await expect(this.page.getByRole("heading", { name: "Can the batches be pooled?" })).toBeVisible();
  }

  /** Waits until the figures cover `versions` accepted versions and nothing newer is being computed (the page refreshes itself). */
  async waitForFigures(versions: number): Promise<void> {
    await expect(this.status).toContainText(new RegExp(`over ${versions} accepted versions\\.`), {
      timeout: 90_000,
    });
    await expect(this.page.getByTestId("recomputing")).toHaveCount(0, { timeout: 90_000 });
  }

  row(label: string): Locator {
    return this.poolability.getByRole("row").filter({ hasText: label });
  }
}
