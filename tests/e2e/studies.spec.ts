import { writeFileSync } from "node:fs";
import { expect, test, type Locator, type Page } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";
import { watchPageProblems } from "./pages/csp-watch";

/** The plan editor at /studies/:slug/plan. */
class PlanEditorPage {
  readonly publish: Locator;
  readonly p: Locator;
  readonly problems: Locator;
  constructor(readonly page: Page) {
    this.publish = page.getByRole("button", { name: /Publish as version/ });
    this.p = page.getByTestId("model-p");
    this.problems = page.locator("[role=alert][tabindex]");
  }
  row(position: number): Locator {
    return this.page.locator(`[data-column-row="${position - 1}"]`);
  }
}

// A sample of an invented oat trial: 5 columns; soil has 3 levels → p = 1 (nitrogen) + 2 (soil) + 1 (irrigated) = 4
const SAMPLE = [
  "plot_id,yield,nitrogen,soil,irrigated",
  "P1,5.1,100,clay,yes",
  "P2,6.2,120,loam,no",
  "P3,4.8,80,clay,yes",
  "P4,5.5,140,sand,no",
  "P5,5.9,NA,loam,yes",
  "P6,6.0,110,clay,no",
].join("\n");

test("a lead creates a study, drafts its plan from a sample, fixes a refused plan, publishes two versions and admits a provider", async ({
  page,
  browser,
}, info) => {
  // a long journey through five pages and three publishes
  test.setTimeout(240_000);
  const watch = watchPageProblems(page);
  const slug = `oat-trial-${Date.now().toString(36)}`;
  await new SignInPage(page).signInAs("lead@lowmoor.test");

  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Studies" }).click();
  await page.getByRole("link", { name: "New study" }).click();
  await page.getByLabel("Title").fill("Oat trial");
  await page.getByLabel("Address").fill("barley-nitrogen");
  await page.getByRole("button", { name: "Create study" }).click();
  await expect(page.locator("#study-slug-error")).toContainText("already uses this address");
  await page.getByLabel("Address").fill(slug);
  await page.getByRole("button", { name: "Create study" }).click();
  await page.waitForURL(`**/studies/${slug}/plan?created=1`);

  const editor = new PlanEditorPage(page);
  await expect(editor.publish).toHaveText(/version 1/);
  const file = info.outputPath("oat-sample.csv");
  writeFileSync(file, SAMPLE);
  await page.locator("input[type=file]").setInputFiles(file);
  await expect(page.getByText(/Drafted from oat-sample\.csv/).first()).toBeVisible();
  await expect(editor.p).toHaveText("4");
  await expect(editor.row(2).getByLabel("Role")).toHaveValue("response");

  // two columns with one name: the server's message appears beside the second name
  await editor.row(5).getByLabel("Name").fill("soil");
  await editor.publish.click();
  await expect(editor.problems).toContainText("column names must be unique");
  await expect(editor.row(5).locator("p[id$='-name-error']")).toContainText('"soil" is already column 4');
  await editor.row(5).getByLabel("Name").fill("irrigated");

  // baseline and level order from the keyboard
  await editor.row(4).getByLabel("Baseline level").selectOption("loam");
  await editor.row(4).getByRole("button", { name: "Move level loam up" }).focus();
  await page.keyboard.press("Enter");
  await expect(editor.row(4).locator("ol li").first()).toContainText("loam");
  await page.getByLabel("Note (optional)").fill("drafted from the first sample");
  await editor.publish.click();
  await page.waitForURL(`**/studies/${slug}`);
  await expect(page.getByRole("heading", { name: "Data plan, version 1" })).toBeVisible();

  // version 2 with an interaction: p goes up by the soil indicator count (2)
  await page.getByRole("link", { name: "Edit the data plan" }).click();
  await expect(editor.publish).toHaveText(/version 2/);
  await page.locator("#interaction-a").selectOption("nitrogen");
  await page.locator("#interaction-b").selectOption("soil");
  await page.getByRole("button", { name: "Add interaction" }).click();
  await expect(editor.p).toHaveText("6");
  await editor.publish.click();
  await page.waitForURL(`**/studies/${slug}`);
  await expect(page.getByRole("heading", { name: "Data plan, version 2" })).toBeVisible();
  const versions = page
    .locator("section")
    .filter({ has: page.getByRole("heading", { level: 2, name: "Plan versions" }) });
  await expect(versions).toContainText("drafted from the first sample");
  await expect(versions).toContainText("2 rows");

  await page.locator("#add-provider").selectOption({ label: "Fennick Hill Farm" });
  await page.getByRole("button", { name: "Admit" }).click();
  await expect(page.getByRole("heading", { name: "Provider organisations (1)" })).toBeVisible();
  expect(watch.problems).toEqual([]);

  // the admitted provider sees the study; another organisation's provider gets "not found"
  for (const [email, visible] of [
    ["provider@fennick.test", true],
    ["provider@harrowgate.test", false],
  ] as const) {
    const ctx = await browser.newContext();
    const p = await ctx.newPage();
    await new SignInPage(p).signInAs(email);
    await p.goto(`/studies/${slug}`);
    await expect(p.getByRole("heading", { level: 1 })).toContainText(
      visible ? "Oat trial" : "Study not found",
    );
    await ctx.close();
  }
});
