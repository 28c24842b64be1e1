import { readFile } from "node:fs/promises";
import { expect, test, type Locator, type Page } from "@playwright/test";
import Papa from "papaparse";
import { BATCH_STATE_LABELS } from "../../lib/format";
import { SignInPage } from "./pages/sign-in-page";

/** The lead's status board at /board. */
class BoardPage {
  readonly heading: Locator;
  readonly batches: Locator;
  readonly pools: Locator;
  constructor(readonly page: Page) {
    this.heading = page.getByRole("heading", { name: "Status board", level: 1 });
    this.batches = page.locator("#by-state-title").locator("xpath=ancestor::section[1]");
    this.pools = page.getByTestId("pool-headroom");
  }
  async goto(): Promise<void> {
    await this.page.goto("/board");
    await expect(this.heading).toBeVisible();
  }
  batchRow(title: string): Locator {
    return this.batches.getByRole("row").filter({ hasText: title });
  }
}

type BoardJson = {
  data: {
    batches: { title: string; state: keyof typeof BATCH_STATE_LABELS; studySlug: string }[];
    pools: { studySlug: string; studyTitle: string }[];
  };
};
type PoolJson = {
  data: { report: { rows: { total: number; complete: number }; model: { residualDf: number } } };
};

test("a lead sees every batch in its state on the board, opens a study's pool and downloads its rows", async ({
  page,
}) => {
  test.setTimeout(180_000);
  await new SignInPage(page).signInAs("lead@lowmoor.test");
  const board = new BoardPage(page);
  await board.goto();

  // the page and the API agree on where every batch stands
  const api = (await (await page.request.get("/api/v1/board")).json()) as BoardJson;
  for (const b of api.data.batches) {
    await expect(board.batchRow(b.title).first()).toContainText(BATCH_STATE_LABELS[b.state]);
  }
  await expect(board.pools.getByRole("link", { name: "Spring barley nitrogen response" })).toBeVisible();

  await board.pools.getByRole("link", { name: "Spring barley nitrogen response" }).click();
  await expect(page).toHaveURL(/\/pool\/barley-nitrogen$/);
  await expect(page.getByRole("heading", { name: /Pool of Spring barley nitrogen response/ })).toBeVisible();
  const pool = (await (await page.request.get("/api/v1/pool/barley-nitrogen")).json()) as PoolJson;
  await expect(
    page.getByTestId("pool-figures").getByRole("row", { name: /Complete cases \(n\)/ }),
  ).toContainText(pool.data.report.rows.complete.toLocaleString("en-GB"));

  const [download] = await Promise.all([
    page.waitForEvent("download"),
    page.getByTestId("export-rows").click(),
  ]);
  expect(download.suggestedFilename()).toMatch(/^barley-nitrogen-pool-rows-\d{4}-\d{2}-\d{2}\.csv$/);
  const text = await readFile((await download.path())!, "utf8");
  const parsed = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
  expect(parsed.errors).toEqual([]);
  expect(parsed.meta.fields?.slice(0, 5)).toEqual([
    "organisation",
    "batch",
    "batch_title",
    "version",
    "source_row",
  ]);
  expect(parsed.data).toHaveLength(pool.data.report.rows.total);
});

test("an analyst of another study gets no pool, and a provider no board", async ({ browser }) => {
  const analyst = await (await browser.newContext()).newPage();
  await new SignInPage(analyst).signInAs("analyst2@lowmoor.test");
  await analyst.goto("/pool/barley-nitrogen");
  await expect(analyst.getByRole("heading", { name: "Pool not found" })).toBeVisible();
  const provider = await (await browser.newContext()).newPage();
  await new SignInPage(provider).signInAs("provider@harrowgate.test");
  await provider.goto("/board");
  await expect(provider.getByRole("heading", { name: "This page is not here" })).toBeVisible();
  await expect(provider.getByRole("heading", { name: "Status board" })).toHaveCount(0);
});
