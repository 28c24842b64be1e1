import { expect, test, type Page } from "@playwright/test";
import { watchPageProblems } from "./pages/csp-watch";
import { SignInPage } from "./pages/sign-in-page";
import { ROLE_ACCOUNTS } from "./pages/walk";

/**
 * The API reference page: public like /api/v1/openapi.json, drawn by the bundled viewer from
 * that document (its title and the upload operation appear), under the page's real
 * Content-Security-Policy, and without a single request leaving this machine: no fonts, scripts,
 * images or telemetry from elsewhere (the brief of the page; the test server is on 127.0.0.1).
 */

/** Every URL the page asks for that is not on this machine (data: and blob: URLs never leave it). */
function watchOutsideRequests(page: Page): string[] {
  const outside: string[] = [];
  page.on("request", (req) => {
    const url = new URL(req.url());
    if (url.protocol === "data:" || url.protocol === "blob:") return;
    if (url.hostname !== "127.0.0.1") outside.push(req.url());
  });
  return outside;
}

async function expectReferenceDrawn(page: Page) {
  await expect(page.getByRole("heading", { level: 1, name: "API reference" })).toBeVisible();
  // the document's own title (info.title in lib/http/openapi.ts), drawn by the viewer
  await expect(page.getByRole("heading", { name: "Tributary API" })).toBeVisible();
  // the upload: listed in the viewer's index under its tag; followed, its summary is the
  // operation's heading, with its method and path beside it (the viewer draws an operation in
  // full once it is opened)
  await page.getByRole("link", { name: /^Upload a batch file.*HTTP Method: POST$/ }).click();
  const upload = page.getByRole("heading", { name: /Upload a batch file/ }).first();
  await expect(upload).toBeVisible();
  const section = page.locator("section, .section", { has: upload }).last();
  await expect(section.getByText("POST", { exact: true }).first()).toBeVisible();
  await expect(section.getByText("/api/v1/batches", { exact: true }).first()).toBeVisible();
}

test("the API reference is public, drawn from the served document, and loads nothing from elsewhere", async ({
  page,
}) => {
  const outside = watchOutsideRequests(page);
  const { problems } = watchPageProblems(page);
  const documentAsked = page.waitForRequest((r) => new URL(r.url()).pathname === "/api/v1/openapi.json");
  const res = await page.goto("/api-reference");
  expect(res?.status()).toBe(200);
  expect(new URL(page.url()).pathname).toBe("/api-reference");
  await documentAsked;
  await expectReferenceDrawn(page);
  await page.waitForLoadState("networkidle");
  expect(outside).toEqual([]);
  expect(problems).toEqual([]);
});

test("a signed-in person reaches the reference from Settings → API tokens", async ({ page }) => {
  await new SignInPage(page).signInAs(ROLE_ACCOUNTS.provider);
  const outside = watchOutsideRequests(page);
  await page.goto("/settings");
  await page.getByRole("region", { name: "API tokens" }).getByRole("link", { name: "API reference" }).click();
  await page.waitForURL(/\/api-reference$/);
  await expectReferenceDrawn(page);
  expect(outside).toEqual([]);
});
