/**
 * A long list in the pages never silently stops (README "Lists page"): with more API tokens
 * (made and revoked, as a person holds at most 20 active ones) than one page holds (100, lib/http/page.ts), Settings says more follow and "Show the next 100"
 * loads the rest from the API's `next` address, each token once.
 */
import { expect, test } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";
import { watchPageProblems } from "./pages/csp-watch";

const PAGE = 100;

test("the tokens table shows the next page on request, until every token is there", async ({ page }) => {
  const watch = watchPageProblems(page);
  const admin = new SignInPage(page);
  await admin.signInAs("admin@tributary.test");
  // a person of their own, so no other test's settings page holds these tokens
  const me = await (await page.request.get("/api/v1/me")).json();
  const email = `e2e-paging-${Date.now().toString(36)}@lowmoor.test`;
  const password = "lowmoor-e2e-pass-1";
  const created = await page.request.post("/api/v1/admin/users", {
    data: {
      name: "Paging Tester",
      email,
      role: "analyst",
      organisationId: me.data.organisation.id,
      password,
    },
  });
  expect(created.status()).toBe(201);
  await page.context().clearCookies();

  await new SignInPage(page).signInAs(email, password);
  for (let i = 1; i <= PAGE + 1; i++) {
    const r = await page.request.post("/api/v1/tokens", { data: { name: `script ${i}` } });
    expect(r.status()).toBe(201);
    // a person holds at most 20 active tokens: revoked ones stay listed
    const revoked = await page.request.delete(r.headers()["location"]!);
    expect(revoked.status()).toBe(200);
  }
  await page.goto("/settings");
  const tokens = page.getByRole("region", { name: "API tokens" });
  await expect(tokens.locator("tbody tr")).toHaveCount(PAGE);
  await expect(tokens.getByTestId("show-next")).toContainText(`${PAGE} tokens shown; more follow.`);
  // newest first: the first token made is the one the second page brings
  await expect(tokens.getByRole("cell", { name: "script 1", exact: true })).toHaveCount(0);
  await tokens.getByRole("button", { name: `Show the next ${PAGE} tokens` }).click();
  await expect(tokens.locator("tbody tr")).toHaveCount(PAGE + 1);
  await expect(tokens.getByRole("cell", { name: "script 1", exact: true })).toHaveCount(1);
  await expect(tokens.getByTestId("show-next")).toHaveCount(0);
  expect(watch.problems).toEqual([]);
});
