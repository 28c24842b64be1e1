import { expect, test, type Browser, type Page } from "@playwright/test";
import { barleyBatches } from "../../lib/demo/batches";
import { DEMO_USERS } from "../../lib/demo/accounts";
import { BatchPage } from "./pages/batch-page";
import { PoolPage } from "./pages/pool-page";
import { SignInPage } from "./pages/sign-in-page";

// The demo's accepted barley batches (lib/demo/batches.ts) sent through the real pipeline and
// accepted by the analyst: the worker computes the pool's questions, and the pool page shows
// the farm whose nitrogen response differs (Brackenridge), the criteria and the CV curve.
test.describe.configure({ mode: "serial" });

const ACCEPTED = barleyBatches().filter((b) => b.decision?.decision === "accept");
const ODD = ACCEPTED.find((b) => b.organisationSlug === "brackenridge")!;
const NORMAL = ACCEPTED.filter((b) => b !== ODD);
const label = (title: string) => `${title}, v1`;
const ids = new Map<string, string>();

async function as(browser: Browser, email: string): Promise<Page> {
  const page = await (await browser.newContext()).newPage();
  await new SignInPage(page).signInAs(email);
  return page;
}

type Chow = {
  id: string;
  label: string;
  F: number | null;
  p: number | null;
  largest: { column: string; shift: number } | null;
};
type Poolability = {
  data: {
    versionIds: number[];
    recomputing: boolean;
    poolability: { batches: Chow[] } | null;
    influence: { threshold: number };
  };
};

test("the providers send the demo's accepted barley batches through the API", async ({ browser }) => {
  test.setTimeout(180_000);
  for (const b of ACCEPTED) {
    const provider = DEMO_USERS.find(
      (u) => u.role === "provider" && u.active && u.organisationSlug === b.organisationSlug,
    )!;
    const page = await as(browser, provider.email);
    const res = await page.request.post("/api/v1/batches", {
      multipart: {
        study: b.studySlug,
        label: b.title,
        file: { name: b.fileName, mimeType: "text/csv", buffer: Buffer.from(b.csv) },
      },
    });
    expect(res.status(), await res.text()).toBe(201);
    ids.set(b.title, ((await res.json()) as { data: { batchId: string } }).data.batchId);
    await page.context().close();
  }
});

test("before Brackenridge is accepted, its If accepted shows it would not pool", async ({ browser }) => {
  test.setTimeout(240_000);
  const page = await as(browser, "analyst@lowmoor.test");
  const batch = new BatchPage(page);
  for (const b of NORMAL) {
    await page.goto(`/batches/${ids.get(b.title)}`);
    await batch.waitForReport();
    await batch.decide("accept");
  }
  await page.goto(`/batches/${ids.get(ODD.title)}`);
  await batch.waitForReport();
  const questions = page.getByTestId("if-accepted-questions");
  await expect(questions.getByTestId("questions-status")).toContainText(
    /Computed .* over \d+ accepted versions\./,
    { timeout: 90_000 },
  );
  await expect(questions.getByTestId("recomputing")).toHaveCount(0, { timeout: 90_000 });
  const row = questions
    .getByRole("grid", { name: "Poolability of each batch and provider" })
    .getByRole("row")
    .filter({ hasText: label(ODD.title) });
  await expect(row).toContainText("under review");
  await expect(row).toContainText("nitrogen_kg_ha");
  await expect(row).toContainText("one standard error or more");
  await expect(questions.getByRole("grid", { name: "Poolability warnings if accepted" })).toContainText(
    "pool.not-poolable",
  );
  await batch.decide(
    "accept",
    "Accepted: the plots without an irrigation figure stay out of the complete cases.",
  );
  await page.context().close();
});

test("the barley pool page singles out Brackenridge, and shows the criteria chart and the cross-validation curve", async ({
  browser,
}) => {
  test.setTimeout(180_000);
  const page = await as(browser, "lead@lowmoor.test");
  const api = async () =>
    (await (await page.request.get("/api/v1/pool/barley-nitrogen/poolability")).json()) as Poolability;
  // the worker has stored figures with Brackenridge in the pool (other browser tests may have added versions too)
  await expect
    .poll(
      async () => {
        const d = (await api()).data;
        return !d.recomputing && (d.poolability?.batches ?? []).some((b) => b.label === label(ODD.title));
      },
      { timeout: 90_000 },
    )
    .toBe(true);
  const fresh = (await api()).data;
  const pool = new PoolPage(page);
  await pool.goto("barley-nitrogen");
  await pool.waitForFigures(fresh.versionIds.length);

  // Brackenridge alone differs from the rest by Chow's test, with its nitrogen coefficient the largest shift
  const batches = fresh.poolability!.batches;
  const odd = batches.find((b) => b.label === label(ODD.title))!;
  expect(odd.p!).toBeLessThan(0.05);
  expect(odd.largest!.column).toBe("nitrogen_kg_ha");
  expect(odd.largest!.shift).toBeGreaterThanOrEqual(fresh.influence.threshold);
  expect(odd.F!).toBe(Math.max(...batches.map((b) => b.F ?? 0)));
  const row = pool.row(label(ODD.title)).first();
  // printed as every statistic is (lib/readiness/format-number.ts: three significant digits)
  await expect(row).toContainText(Number(odd.F!.toPrecision(3)).toLocaleString("en-GB"));
  await expect(row).toContainText("one standard error or more");
  await expect(pool.findings).toContainText("pool.not-poolable");
  await expect(pool.findings).toContainText(label(ODD.title));
  await expect(pool.influence).toHaveAttribute(
    "aria-label",
    new RegExp(`${label(ODD.title)}: [0-9.]+ SE, at or above the threshold`),
  );
  await expect(pool.influence.locator(".recharts-reference-line")).toHaveCount(1);

  await expect(pool.overall).toContainText("Together the predictors explain more than chance would");
  await expect(pool.caution).toContainText("Selection on the same data overstates the fit");
  await expect(pool.criteria.locator("figure")).toHaveCount(4);
  await expect(pool.criteria.locator(".recharts-line").first()).toBeVisible();
  await expect(pool.cvCurve).toBeVisible();
  await expect(pool.cvCurve).toHaveAttribute(
    "aria-label",
    /^Leave-one-batch-out mean squared prediction error .* by subset size; picks size \d+\. size 0: /,
  );
  await expect(page.getByRole("grid", { name: "Best subset of each size" })).toContainText("soil");
  await page.context().close();
});
