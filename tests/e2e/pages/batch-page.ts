import { expect, type Locator, type Page } from "@playwright/test";

/** /upload and /batches/<id>: choosing a file, the check before upload, the report, the decision. */
export class BatchPage {
  readonly precheck: Locator;
  readonly verdict: Locator;
  readonly findings: Locator;
  /** The file input once the page is live: the panel takes a file from its script on (data-ready). */
  readonly fileInput: Locator;

  constructor(readonly page: Page) {
    this.precheck = page.getByTestId("precheck");
    this.verdict = page.getByTestId("verdict");
    // react-table-library renders its tables with the grid role
    this.findings = page.getByRole("grid", { name: "Findings" });
    this.fileInput = page.locator('[data-testid="batch-file-input"][data-ready="true"]');
  }

  /** Chooses a file (built in memory) in the upload panel. */
  async chooseFile(name: string, csv: string): Promise<void> {
    await this.fileInput.setInputFiles({ name, mimeType: "text/csv", buffer: Buffer.from(csv, "utf8") });
  }

  async upload(): Promise<string> {
    await this.page.getByTestId("upload-button").click();
    await this.page.waitForURL(/\/batches\/[A-Za-z0-9_-]+$/, { timeout: 60_000 });
    return new URL(this.page.url()).pathname.split("/")[2] ?? "";
  }

  /** Waits until the report is on the page (the worker has checked the version). */
  async waitForReport(): Promise<void> {
    await expect(this.verdict).toBeVisible({ timeout: 60_000 });
  }

  /** Writes a comment on the finding's own row (showing every finding first when the table is collapsed). */
  async commentOnFinding(code: string, text: string): Promise<void> {
    const field = this.page.locator(`textarea[data-finding-code="${code}"]`).first();
    const showAll = this.page.getByRole("button", { name: /^Show all \d+ rows of Findings$/ });
    if ((await field.count()) === 0 && (await showAll.count()) > 0) await showAll.click();
    await field.fill(text);
  }

  /** Decides from the summary bar, which stays in view. */
  async decide(decision: "accept" | "bounce", comment = ""): Promise<void> {
    const form = this.page.getByTestId("decision-form");
    if (comment) await form.getByLabel("Comment to the provider").fill(comment);
    await form.getByTestId(decision === "accept" ? "accept-button" : "bounce-button").click();
    await expect(this.page.getByTestId("decision")).toBeVisible({ timeout: 30_000 });
  }
}
