import { expect, test } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";
import { AdminUsersPage } from "./pages/admin-users-page";
import { PortalPage } from "./pages/portal-page";
import { watchPageProblems } from "./pages/csp-watch";

const WRONG = "E-mail or password is wrong, or the account is deactivated.";

test("admin creates a user, changes the role, deactivates them, and the account stops working", async ({
  page,
  browser,
}) => {
  const watch = watchPageProblems(page);
  // unique per run, so a retry against the same database does not collide
  const email = `e2e-${Date.now().toString(36)}@lowmoor.test`;
  const password = "lowmoor-e2e-pass-1";

  await new SignInPage(page).signInAs("admin@tributary.test");
  const admin = new AdminUsersPage(page);
  await admin.goto();

  // a bad form first: field errors appear next to the fields and the typed values stay
  await admin.createForm.getByLabel("Name").fill("Dana Rowe");
  await admin.createForm.getByLabel("E-mail").fill("not-an-email");
  await admin.createForm.getByRole("button", { name: "Create user" }).click();
  await expect(admin.createForm.locator("#new-email-error")).toContainText("e-mail address");
  await expect(admin.createForm.getByLabel("Name")).toHaveValue("Dana Rowe");

  await admin.createUser({
    name: "Dana Rowe",
    email,
    roleLabel: "Analyst",
    organisation: "Lowmoor Valley Crop Trials",
    password,
  });
  await expect(admin.toast(`Account created for ${email}`)).toBeVisible();
  const row = admin.row(email);
  await expect(row).toContainText("Lowmoor Valley Crop Trials");
  await expect(row).toContainText("Active");

  // the new account works
  const ctx = await browser.newContext();
  const other = await ctx.newPage();
  await new SignInPage(other).signInAs(email, password);
  await expect(other).toHaveURL(/\/analyst$/);
  await expect(new PortalPage(other).user).toContainText("Dana Rowe");

  await admin.changeRole(email, "Lead");
  await expect(admin.toast("Dana Rowe is now lead")).toBeVisible();
  await page.reload();
  await expect(page.getByRole("combobox", { name: `Role of ${email}` })).toHaveValue("lead");
  // the promotion shows at the user's next request: their home is now the lead's
  await other.goto("/");
  await expect(other).toHaveURL(/\/lead$/);

  await admin.deactivate(email);
  await expect(admin.toast("Dana Rowe is deactivated")).toBeVisible();
  await expect(admin.row(email)).toContainText("Deactivated");
  await expect(page.getByRole("button", { name: `Reactivate ${email}` })).toBeVisible();

  // the open session of the deactivated user ends at its next request
  await other.goto("/lead");
  await expect(other).toHaveURL(/\/sign-in/);
  // and signing in again is refused
  const again = new SignInPage(other);
  await again.signIn(email, password);
  await expect(again.error).toHaveText(WRONG);
  await ctx.close();

  expect(watch.problems).toEqual([]);
});

test("a provider account's role cannot be swapped to a team role in the table", async ({ page }) => {
  await new SignInPage(page).signInAs("admin@tributary.test");
  const admin = new AdminUsersPage(page);
  await admin.goto();
  await expect(page.getByRole("combobox", { name: "Role of provider@harrowgate.test" })).toBeDisabled();
});

test("a provider cannot open the users page", async ({ page }) => {
  await new SignInPage(page).signInAs("provider@fennick.test");
  await page.goto("/admin/users");
  await expect(page).toHaveURL(/\/provider$/);
  await expect(page.getByRole("heading", { level: 1, name: "Users" })).toHaveCount(0);
});
