import { mkdtemp, rm, writeFile } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { expect, test, type Browser, type Page } from "@playwright/test";
import { BARLEY_DATASET, hostileFile } from "../fixtures/hostile-files";
import { SignInPage } from "./pages/sign-in-page";
import { BatchPage } from "./pages/batch-page";
import { watchPageProblems } from "./pages/csp-watch";

// Hostile files through the provider's upload page: the rules refuse an empty file in the form,
// the check in the browser (a Web Worker) names what is wrong with an unreadable file, the
// provider may still upload it and the server's worker ends it `unreadable` with the same
// message; a 20 MB line leaves the page responsive; decimal commas are reported. After each
// case another page of the app loads: the server stayed up. Cases from tests/fixtures/hostile-files.ts.
test.describe.configure({ mode: "serial" });

const PROVIDER = "provider@fennick.test";
const file = (id: string) => hostileFile(BARLEY_DATASET, id);

const problems = new Map<Page, { problems: string[] }>();

async function signedIn(browser: Browser): Promise<Page> {
  const page = await (await browser.newContext()).newPage();
  problems.set(page, watchPageProblems(page));
  await new SignInPage(page).signInAs(PROVIDER);
  await page.goto("/upload");
  return page;
}

async function choose(page: Page, id: string): Promise<void> {
  const f = file(id);
  await new BatchPage(page).fileInput.setInputFiles({
    name: f.fileName,
    mimeType: "text/csv",
    buffer: Buffer.from(f.bytes()),
  });
}

/** The server still answers (the provider's home loads), and the page ran without CSP refusals or uncaught errors. */
async function serverStaysUp(page: Page): Promise<void> {
  const res = await page.goto("/provider");
  expect(res?.status()).toBe(200);
  await expect(page.getByRole("main")).toBeVisible();
  expect(problems.get(page)?.problems).toEqual([]);
}

test("an empty file is refused in the form with what to do, and nothing can be uploaded", async ({
  browser,
}) => {
  const page = await signedIn(browser);
  await choose(page, "empty");
  await expect(page.getByRole("main").getByRole("alert")).toContainText(
    '"empty.csv" is empty (0 bytes). Choose the file that holds the batch.',
  );
  await expect(page.getByTestId("upload-button")).toBeDisabled();
  await serverStaysUp(page);
  await page.context().close();
});

test("a workbook renamed .csv: the browser check says it is a workbook; uploaded anyway, the batch ends unreadable with the same message", async ({
  browser,
}) => {
  const page = await signedIn(browser);
  const batch = new BatchPage(page);
  await choose(page, "xlsx-renamed");
  await expect(batch.precheck).toContainText("file.unreadable", { timeout: 30_000 });
  await expect(batch.precheck).toContainText(
    "This is an Excel workbook (or another zip archive), not a CSV file.",
  );
  await expect(batch.precheck).toContainText("Save As → CSV UTF-8");
  await batch.upload();
  await batch.waitForReport();
  await expect(batch.verdict).toContainText("This file could not be read");
  await expect(page.getByRole("main")).toContainText("Unreadable");
  await expect(batch.findings).toContainText(
    "This is an Excel workbook (or another zip archive), not a CSV file.",
  );
  await serverStaysUp(page);
  await page.context().close();
});

test("binary bytes: the browser check names the byte; uploaded anyway, the batch ends unreadable", async ({
  browser,
}) => {
  const page = await signedIn(browser);
  const batch = new BatchPage(page);
  await choose(page, "binary");
  await expect(batch.precheck).toContainText("binary content at byte 8", { timeout: 30_000 });
  await batch.upload();
  await batch.waitForReport();
  await expect(batch.verdict).toContainText("This file could not be read");
  await expect(batch.findings).toContainText("binary content at byte 8");
  await serverStaysUp(page);
  await page.context().close();
});

test("a 20 MB line without a line break: the page stays responsive while the browser check runs, and the message appears", async ({
  browser,
}) => {
  const page = await signedIn(browser);
  const batch = new BatchPage(page);
  // from disk, so the browser reads the file itself (a buffer would be decoded on the page's main thread)
  const dir = await mkdtemp(path.join(os.tmpdir(), "tributary-e2e-hostile-"));
  const onDisk = path.join(dir, file("long-line").fileName);
  await writeFile(onDisk, file("long-line").bytes());
  try {
    // a heartbeat on the page's main thread: the longest gap between ticks of a 20 ms timer
    const longestGap = () => page.evaluate(() => (window as unknown as { beat: { max: number } }).beat.max);
    await page.evaluate(() => {
      const w = window as unknown as { beat: { max: number; last: number } };
      w.beat = { max: 0, last: performance.now() };
      setInterval(() => {
        const now = performance.now();
        w.beat.max = Math.max(w.beat.max, now - w.beat.last);
        w.beat.last = now;
      }, 20);
    });
    await batch.fileInput.setInputFiles(onDisk);
    // the page answers input while the check runs in its Web Worker
    await page.getByLabel("Batch name (optional)").fill("one long line");
    await expect(page.getByLabel("Batch name (optional)")).toHaveValue("one long line");
    await expect(batch.precheck).toContainText("Line 2 runs on for more than 4 MB without a line break", {
      timeout: 60_000,
    });
    // the engine runs in the Web Worker, and rendering its result is small; 500 ms leaves room for
    // a machine shared with builds and other test runs
    const gap = await longestGap();
    console.log(`longest main-thread gap while checking a 20 MB line: ${gap.toFixed(0)} ms`);
    expect(gap).toBeLessThan(500);
    // the instrument works: a 300 ms task made on purpose shows as a gap
    await page.evaluate(() => {
      const end = performance.now() + 300;
      while (performance.now() < end);
    });
    await expect.poll(longestGap).toBeGreaterThanOrEqual(290);
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
  await serverStaysUp(page);
  await page.context().close();
});

test("semicolons with decimal commas: reported before upload and in the report, with the decimal-comma finding", async ({
  browser,
}) => {
  const page = await signedIn(browser);
  const batch = new BatchPage(page);
  await choose(page, "decimal-comma");
  await expect(batch.precheck).toContainText("number.decimal-comma", { timeout: 30_000 });
  await batch.upload();
  await batch.waitForReport();
  await expect(batch.verdict).toContainText("Needs fixes");
  await expect(page.getByRole("main")).toContainText("Awaiting review");
  await expect(batch.findings).toContainText("decimal comma");
  await serverStaysUp(page);
  await page.context().close();
});
