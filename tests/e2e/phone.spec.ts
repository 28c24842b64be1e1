import { expect, test, type Page } from "@playwright/test";
import { formatLocalDateTime } from "../../lib/format";
import { SignInPage } from "./pages/sign-in-page";
import { ROLE_ACCOUNTS } from "./pages/walk";

/**
 * At phone width (390 × 844 CSS px, a common phone viewport [common practice]) every role's home
 * and a batch page fit the screen: the page never scrolls sideways, tables scroll in their own
 * frame, and the top bar folds into a menu that opens and closes from the keyboard.
 * The browser's zone is Auckland, so the timestamps show the viewer's local time, not UTC.
 */
const ZONE = "Pacific/Auckland";
test.use({ viewport: { width: 390, height: 844 }, timezoneId: ZONE });

async function expectNoSidewaysScroll(page: Page): Promise<void> {
  const { scrollWidth, innerWidth } = await page.evaluate(() => ({
    scrollWidth: document.documentElement.scrollWidth,
    innerWidth: window.innerWidth,
  }));
  expect(
    scrollWidth,
    `${page.url()} is ${scrollWidth} px wide in a ${innerWidth} px window`,
  ).toBeLessThanOrEqual(innerWidth);
}

/** A batch the signed-in person may see: the first of their list through the API (the same scope as the pages). */
async function firstBatchPath(page: Page): Promise<string> {
  const res = await page.request.get("/api/v1/batches?limit=1");
  expect(res.status()).toBe(200);
  const body = (await res.json()) as { data: { publicId: string }[] };
  expect(body.data.length, "the signed-in person sees at least one batch").toBeGreaterThan(0);
  return `/batches/${body.data[0]!.publicId}`;
}

for (const [role, email] of Object.entries(ROLE_ACCOUNTS)) {
  test(`the ${role}'s home fits a 390 px phone, with the top bar as a menu`, async ({ page }) => {
    test.setTimeout(120_000);
    await new SignInPage(page).signInAs(email);
    await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
    await expectNoSidewaysScroll(page);

    // the links are folded away; the menu button opens them (Enter on the focused button)
    const menu = page.getByRole("button", { name: "Menu" });
    await expect(menu).toHaveAttribute("aria-expanded", "false");
    await expect(page.getByRole("navigation", { name: "Main" })).toBeHidden();
    await menu.focus();
    await page.keyboard.press("Enter");
    await expect(menu).toHaveAttribute("aria-expanded", "true");
    const nav = page.getByRole("navigation", { name: "Main" });
    await expect(nav.getByRole("link", { name: "Home" })).toBeVisible();
    await expect(page.getByRole("button", { name: "Sign out" })).toBeVisible();
    await expectNoSidewaysScroll(page);
    // Escape closes it and gives the focus back to the button
    await page.keyboard.press("Escape");
    await expect(menu).toHaveAttribute("aria-expanded", "false");
    await expect(menu).toBeFocused();
    await expect(nav).toBeHidden();

    // following a link from the menu closes it (from another page, so that the link navigates)
    await page.goto("/settings");
    await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
    await menu.click();
    await nav.getByRole("link", { name: "Home" }).click();
    await page.waitForURL(/\/(provider|analyst|lead|admin)$/);
    await expect(menu).toHaveAttribute("aria-expanded", "false");
  });
}

// Mended 2026-12-03: the report's grid sized its one column to the widest table's min-content
// (1,194 px), and the page header's actions would not wrap. The page was 1,018–1,210 px wide.
for (const [role, email] of Object.entries(ROLE_ACCOUNTS)) {
  test(`the ${role}'s batch page fits a 390 px phone`, async ({ page }) => {
    await new SignInPage(page).signInAs(email);
    const batch = await firstBatchPath(page);
    await page.goto(batch);
    await page.waitForLoadState("load");
    await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
    await expectNoSidewaysScroll(page);
  });
}

test("timestamps show the viewer's local time, with the UTC time on hover", async ({ page }) => {
  await new SignInPage(page).signInAs(ROLE_ACCOUNTS.provider);
  const stamp = page.locator("main time").first();
  await expect(stamp).toBeVisible();
  const iso = (await stamp.getAttribute("datetime")) ?? "";
  expect(iso).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
  // the hover text is the same instant in UTC, ISO 8601 to the second
  await expect(stamp).toHaveAttribute("title", `${iso.replace(/\.\d{3}Z$/, "Z")} (UTC)`);
  // Auckland is UTC+12 (NZST) or UTC+13 (NZDT) [IANA tz database, zone Pacific/Auckland]
  await expect(stamp).toHaveText(/GMT\+1[23]$/);
  await expect(stamp).toHaveText(formatLocalDateTime(iso, { timeZone: ZONE }));
});
