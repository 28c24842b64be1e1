import { readFile } from "node:fs/promises";
import { expect, test } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";
import { AdminUsersPage } from "./pages/admin-users-page";

// The users table of /admin/users stands for every DataTable: sort, filter, CSV.
test("a table sorts, filters and downloads what it shows as CSV", async ({ page }) => {
  await new SignInPage(page).signInAs("admin@tributary.test");
  const admin = new AdminUsersPage(page);
  await admin.goto();
  const table = page.getByRole("grid", { name: "Users" });
  const firstEmail = () => table.locator("tbody tr").first().locator("td").nth(1);

  // sort by e-mail: ascending puts admin@tributary.test first, a second click reverses
  await table.getByRole("button", { name: "E-mail" }).click();
  await expect(firstEmail()).toHaveText("admin@tributary.test");
  await expect(table.getByRole("columnheader", { name: "E-mail" })).toHaveAttribute("aria-sort", "ascending");
  await table.getByRole("button", { name: "E-mail" }).click();
  await expect(table.getByRole("columnheader", { name: "E-mail" })).toHaveAttribute(
    "aria-sort",
    "descending",
  );
  await expect(firstEmail()).not.toHaveText("admin@tributary.test");

  // filter: the seed has two accounts at harrowgate.test (one of them deactivated)
  await admin.filter.fill("harrowgate.test");
  await expect(table.locator("tbody tr")).toHaveCount(2);
  await expect(page.getByText(/^2 of \d+ rows$/)).toBeVisible();

  const [download] = await Promise.all([
    page.waitForEvent("download"),
    page.getByRole("button", { name: "Download CSV" }).click(),
  ]);
  expect(download.suggestedFilename()).toBe("tributary-users.csv");
  const csv = await readFile(await download.path(), "utf8");
  const lines = csv.trimEnd().split("\r\n");
  expect(lines[0]).toBe("Name,E-mail,Role,Organisation,Status,Created");
  expect(lines).toHaveLength(3);
  expect(csv).toContain("provider@harrowgate.test");
  expect(csv).toContain("inactive@harrowgate.test,provider,Harrowgate Farm,deactivated");
  expect(csv).not.toContain("fennick");
});
