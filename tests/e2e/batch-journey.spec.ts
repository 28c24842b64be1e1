import { Readable } from "node:stream";
import { expect, test, type Browser, type Page } from "@playwright/test";
import { BARLEY_HEADER, barleyBatches, barleyRows, toCsv } from "../../lib/demo/batches";
import { SignInPage } from "./pages/sign-in-page";
import { BatchPage } from "./pages/batch-page";

// The whole loop of README.md "Using Tributary, role by role", on invented demo data (lib/demo/batches.ts):
// a provider uploads a file with a misspelled level and an exact dependency, an analyst bounces it
// with two comments, the provider reads the e-mail, sends version 2, the analyst accepts it.
test.describe.configure({ mode: "serial" });

const FENNICK = barleyBatches()[1]!;
let batchId = "";

async function as(browser: Browser, email: string): Promise<Page> {
  const context = await browser.newContext();
  const page = await context.newPage();
  await new SignInPage(page).signInAs(email);
  return page;
}

/** The newest message for the signed-in user whose subject matches, from the demo mailbox. */
async function openMail(page: Page, subject: RegExp): Promise<string> {
  await expect(async () => {
    await page.goto("/mailbox");
    await expect(page.getByTestId("mailbox").getByRole("link", { name: subject }).first()).toBeVisible({
      timeout: 2_000,
    });
  }).toPass({ timeout: 60_000 });
  await page.getByTestId("mailbox").getByRole("link", { name: subject }).first().click();
  return (await page.getByTestId("mail-text").textContent()) ?? "";
}

test("a provider sees the faults before upload, then the report with the variant level and the exact dependency", async ({
  browser,
}) => {
  const page = await as(browser, "provider@fennick.test");
  await page.goto("/upload");
  const batch = new BatchPage(page);
  await batch.chooseFile(FENNICK.fileName, FENNICK.csv);
  // the engine runs in a Web Worker on the chosen file, before anything is sent
  await expect(batch.precheck).toContainText("level.variant", { timeout: 60_000 });
  await expect(batch.precheck).toContainText("collinear.exact");
  batchId = await batch.upload();
  await batch.waitForReport();
  await expect(batch.verdict).toContainText("Needs fixes");
  await expect(batch.findings).toContainText("level.variant");
  await expect(batch.findings).toContainText("total_water_mm = irrigation_mm + rainfall_mm");
  await page.context().close();
});

test("the assigned analyst sees the same report and bounces it with two comments; another analyst cannot see it", async ({
  browser,
}) => {
  const other = await as(browser, "analyst2@lowmoor.test");
  await other.goto(`/batches/${batchId}`);
  await expect(other.getByRole("heading", { name: "Batch not found" })).toBeVisible();
  await other.context().close();

  const page = await as(browser, "analyst@lowmoor.test");
  await page.goto(`/batches/${batchId}`);
  const batch = new BatchPage(page);
  await batch.waitForReport();
  await expect(batch.findings).toContainText("total_water_mm = irrigation_mm + rainfall_mm");
  await batch.commentOnFinding(
    "level.variant",
    "Write the soil level as clay, lower case, no trailing space.",
  );
  await batch.commentOnFinding(
    "collinear.exact",
    "Send the plot gauge reading, not irrigation plus rainfall.",
  );
  await batch.decide("bounce", "Two fixes needed before this can join the pool.");
  await expect(page.getByTestId("decision")).toContainText("Bounced by Tobias Ferrell");
  await page.context().close();
});

test("the provider gets the e-mail with both comments and the link, downloads the rows at fault, and sends version 2 which resolves them", async ({
  browser,
}) => {
  const page = await as(browser, "provider@fennick.test");
  const text = await openMail(page, /bounced/);
  expect(text).toContain("Write the soil level as clay");
  expect(text).toContain("Send the plot gauge reading");
  expect(text).toContain(`/batches/${batchId}?v=1`);

  await page.goto(`/batches/${batchId}`);
  // the rows at fault, with their finding codes, to fix in the provider's own tools
  const [download] = await Promise.all([
    page.waitForEvent("download"),
    page.getByTestId("rows-at-fault").click(),
  ]);
  const faulty = await new Response(
    Readable.toWeb(await download.createReadStream()) as ReadableStream,
  ).text();
  expect(faulty.split("\n")[0]).toContain("finding_codes");
  expect(faulty).toContain("level.variant");
  await page.getByRole("link", { name: "Upload a new version" }).click();
  const batch = new BatchPage(page);
  // the corrected file: same plots, plan spellings and the gauge's own water column
  await batch.chooseFile("fennick-hill-2026-v2.csv", toCsv(BARLEY_HEADER, barleyRows("FH", 160, 202)));
  await expect(batch.precheck).toContainText("Before upload", { timeout: 60_000 });
  await batch.upload();
  await batch.waitForReport();
  const since = page.getByTestId("since-previous");
  await expect(since).toBeVisible();
  await expect(page.getByText(/Resolved: level\.variant/)).toBeVisible();
  await expect(page.getByText(/Resolved: collinear\.exact/)).toBeVisible();
  await page.context().close();
});

test("the analyst accepts version 2 and the provider gets the acceptance e-mail", async ({ browser }) => {
  const analyst = await as(browser, "analyst@lowmoor.test");
  await analyst.goto(`/batches/${batchId}`);
  const batch = new BatchPage(analyst);
  await batch.waitForReport();
  await expect(analyst.getByRole("navigation", { name: "Versions" })).toContainText("v1 · superseded");
  await batch.decide("accept");
  await expect(analyst.getByTestId("decision")).toContainText("Accepted by Tobias Ferrell");
  await analyst.context().close();

  const provider = await as(browser, "provider@fennick.test");
  const text = await openMail(provider, /version 2 accepted/);
  expect(text).toContain("accepted version 2");
  await provider.context().close();
});
