import { expect, test } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";
import { PortalPage } from "./pages/portal-page";
import { watchPageProblems } from "./pages/csp-watch";

// Demo accounts and their data come from db/seed.ts (README.md "Using Tributary, role by role").
const WRONG = "E-mail or password is wrong, or the account is deactivated.";

test.describe("each role lands on its own home, with its own data", () => {
  test("provider sees Harrowgate Farm and the barley study only", async ({ page }) => {
    const watch = watchPageProblems(page);
    await new SignInPage(page).signInAs("provider@harrowgate.test");
    await expect(page).toHaveURL(/\/provider$/);
    const portal = new PortalPage(page);
    await portal.expectSignedInAs("Harrowgate", "Harrowgate Farm");
    await expect(portal.heading).toHaveText("Harrowgate Farm");
    const studies = portal.section("Studies you are admitted to");
    await expect(studies).toContainText("Spring barley nitrogen response");
    // admitted to barley-nitrogen only (seed): the heat-pump study is not theirs
    await expect(studies).not.toContainText("Heat-pump retrofit savings");
    await expect(portal.nav.getByRole("link", { name: "Users" })).toHaveCount(0);
    expect(watch.problems).toEqual([]);
  });

  test("analyst sees only the study they are assigned to", async ({ page }) => {
    const watch = watchPageProblems(page);
    await new SignInPage(page).signInAs("analyst@lowmoor.test");
    await expect(page).toHaveURL(/\/analyst$/);
    const portal = new PortalPage(page);
    await portal.expectSignedInAs("", "Lowmoor Valley Crop Trials");
    const studies = portal.section("Assigned studies");
    await expect(studies).toContainText("Spring barley nitrogen response");
    await expect(studies).not.toContainText("Heat-pump retrofit savings");
    await expect(portal.section("Ready for review")).toBeVisible();
    expect(watch.problems).toEqual([]);
  });

  test("the second analyst sees the heat-pump study, not the barley one", async ({ page }) => {
    await new SignInPage(page).signInAs("analyst2@lowmoor.test");
    await expect(page).toHaveURL(/\/analyst$/);
    const studies = new PortalPage(page).section("Assigned studies");
    await expect(studies).toContainText("Heat-pump retrofit savings");
    await expect(studies).not.toContainText("Spring barley nitrogen response");
  });

  test("lead sees every study and the providers admitted to each", async ({ page }) => {
    const watch = watchPageProblems(page);
    await new SignInPage(page).signInAs("lead@lowmoor.test");
    await expect(page).toHaveURL(/\/lead$/);
    const studies = new PortalPage(page).section("Studies");
    await expect(studies).toContainText("Spring barley nitrogen response");
    await expect(studies).toContainText("Heat-pump retrofit savings");
    const barley = studies.getByRole("row").filter({ hasText: "Spring barley nitrogen response" });
    await expect(barley).toContainText("Harrowgate Farm");
    await expect(barley).toContainText("Fennick Hill Farm");
    const heat = studies.getByRole("row").filter({ hasText: "Heat-pump retrofit savings" });
    await expect(heat).toContainText("Greenhearth Installers");
    await expect(heat).not.toContainText("Harrowgate Farm");
    expect(watch.problems).toEqual([]);
  });

  test("admin sees the installation's counts and a way to the users", async ({ page }) => {
    const watch = watchPageProblems(page);
    await new SignInPage(page).signInAs("admin@tributary.test");
    await expect(page).toHaveURL(/\/admin$/);
    const portal = new PortalPage(page);
    // seed: one deactivated account (inactive@harrowgate.test), two studies
    await expect(page.locator('[data-figure="inactive"] dd').first()).toHaveText(/^[1-9]\d*$/);
    await expect(page.locator('[data-figure="studies"] dd').first()).toHaveText("2");
    await expect(portal.nav.getByRole("link", { name: "Users" })).toBeVisible();
    expect(watch.problems).toEqual([]);
  });
});

test("a wrong password is refused with a clear message", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("provider@harrowgate.test", "not-the-password");
  await expect(signIn.error).toHaveText(WRONG);
  await expect(page).toHaveURL(/\/sign-in/);
});

test("an unknown e-mail gets the same message as a wrong password", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("nobody@nowhere.test", "tributary-demo");
  await expect(signIn.error).toHaveText(WRONG);
});

test("the deactivated demo user cannot sign in", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  await signIn.signIn("inactive@harrowgate.test");
  await expect(signIn.error).toHaveText(WRONG);
  await page.goto("/provider");
  await expect(page).toHaveURL(/\/sign-in/);
});

test("an anonymous visit to a portal page goes to sign-in", async ({ page }) => {
  for (const path of ["/", "/provider", "/admin/users", "/settings"]) {
    await page.goto(path);
    await expect(page, `visiting ${path}`).toHaveURL(/\/sign-in/);
    await expect(page.getByRole("heading", { name: "Sign in" })).toBeVisible();
  }
});

test("sign-out ends the session", async ({ page }) => {
  await new SignInPage(page).signInAs("lead@lowmoor.test");
  await new PortalPage(page).signOut();
  await page.goto("/lead");
  await expect(page).toHaveURL(/\/sign-in/);
});

test("pages carry the security headers", async ({ request }) => {
  const res = await request.get("/sign-in");
  const h = res.headers();
  expect(h["content-security-policy"]).toContain("frame-ancestors 'none'");
  expect(h["x-content-type-options"]).toBe("nosniff");
  expect(h["referrer-policy"]).toBe("strict-origin-when-cross-origin");
  expect(h["x-powered-by"]).toBeUndefined();
});

test("repeated failures for one e-mail are throttled with a message saying to wait", async ({ page }) => {
  const signIn = new SignInPage(page);
  await signIn.goto();
  // lib/auth/rate-limit.ts: 10 failures per e-mail and address within 15 minutes, then refusal
  const email = `throttle-${Date.now().toString(36)}@nowhere.test`;
  for (let i = 0; i < 10; i++) {
    await signIn.signIn(email, `wrong-${i}`);
    await expect(signIn.error).toHaveText(WRONG);
    await expect(signIn.submit).toBeEnabled();
  }
  await signIn.signIn(email, "wrong-again");
  await expect(signIn.error).toContainText(/too many failed sign-ins/i);
  await expect(signIn.error).toContainText(/wait/i);
});
