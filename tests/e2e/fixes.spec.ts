import { Readable } from "node:stream";
import { expect, test } from "@playwright/test";
import { barleyBatches } from "../../lib/demo/batches";
import { signedIn } from "./pages/sign-in-page";
import { BatchPage } from "./pages/batch-page";

// Issue 12 on the demo's bounced farm (lib/demo/batches.ts: Fennick Hill writes the soil level
// "Clay" and "clay "): the provider applies the level merge in the browser and sends version 2 in
// one step; the analyst sees that it was machine-corrected, by whom, and the change log.
test.describe.configure({ mode: "serial" });

const FENNICK = barleyBatches()[1]!;
let batchId = "";

const as = signedIn;

test("the bounced batch: the provider applies the level merge and sends version 2 in one step", async ({
  browser,
}) => {
  const page = await as(browser, "provider@fennick.test");
  await page.goto("/upload");
  const batch = new BatchPage(page);
  await batch.chooseFile(FENNICK.fileName, FENNICK.csv);
  await expect(batch.precheck).toContainText("level.variant", { timeout: 60_000 });
  batchId = await batch.upload();
  await batch.waitForReport();
  await page.context().close();

  const analyst = await as(browser, "analyst@lowmoor.test");
  await analyst.goto(`/batches/${batchId}`);
  const review = new BatchPage(analyst);
  await review.waitForReport();
  await review.commentOnFinding("level.variant", "Write the soil level as clay.");
  await review.decide("bounce", "Fix the soil spellings.");
  await analyst.context().close();

  const provider = await as(browser, "provider@fennick.test");
  await provider.goto(`/batches/${batchId}`);
  await new BatchPage(provider).waitForReport();
  await provider.getByRole("button", { name: "Find the fixes for this version" }).click();
  const proposals = provider.getByTestId("fix-proposal");
  const merge = provider.locator('[data-testid="fix-proposal"][data-code="level.variant"]');
  await expect(merge.first()).toBeVisible({ timeout: 60_000 });
  await expect(merge.first()).toContainText("“Clay” → “clay”");
  await expect(merge.first()).toContainText("“clay ” → “clay”");
  // only the level merge: untick every other proposal
  const n = await proposals.count();
  for (let i = 0; i < n; i++) {
    const p = proposals.nth(i);
    if ((await p.getAttribute("data-code")) !== "level.variant") await p.getByRole("checkbox").uncheck();
  }
  await provider.getByRole("button", { name: "Apply and send as version 2" }).click();
  await provider.waitForURL(/\?v=2$/, { timeout: 60_000 });
  await new BatchPage(provider).waitForReport();
  await expect(provider.getByTestId("machine-corrected")).toContainText(
    "Produced from version 1 by applying level.variant:soil",
  );
  await expect(provider.getByText(/Resolved: level\.variant/)).toBeVisible();
  await provider.context().close();
});

test("the analyst sees version 2 was machine-corrected, who approved it, and the change log", async ({
  browser,
}) => {
  const page = await as(browser, "analyst@lowmoor.test");
  await page.goto(`/batches/${batchId}?v=2`);
  await new BatchPage(page).waitForReport();
  const box = page.getByTestId("machine-corrected");
  await expect(box).toContainText("Produced from version 1 by applying level.variant:soil");
  await expect(box).toContainText(/Approved by .+ on /);
  const table = page.getByTestId("change-log-table");
  await expect(table).toContainText("soil");
  await expect(table).toContainText("“Clay”");
  const [download] = await Promise.all([
    page.waitForEvent("download"),
    page.getByTestId("change-log").click(),
  ]);
  const csv = await new Response(Readable.toWeb(await download.createReadStream()) as ReadableStream).text();
  const lines = csv.trim().split("\r\n");
  expect(lines[0]).toBe("row,column,before,after,proposal");
  const expected = FENNICK.csv.split(/\r?\n/).filter((l) => /,(Clay|clay ),/.test(l)).length;
  expect(lines.length - 1).toBe(expected);
  expect(lines.slice(1).every((l) => /^\d+,soil,(Clay|clay ),clay,level\.variant:soil$/.test(l))).toBe(true);
  // the original version is untouched and still downloadable as it was sent
  const original = await page.request.get(`/api/v1/batches/${batchId}/versions/1/file`);
  expect(await original.text()).toBe(FENNICK.csv);
  await page.goto(`/batches/${batchId}/trail`);
  await expect(page.getByText(/Machine-corrected version approved/)).toBeVisible();
  await expect(page.getByText(/version 2 made from version 1 by applying level\.variant:soil/)).toBeVisible();
  await page.context().close();
});
