import { readFile } from "node:fs/promises";
import { readFileSync } from "node:fs";
import path from "node:path";
import { expect, test, type APIResponse, type Browser, type Page } from "@playwright/test";
import { barleyBatches } from "../../lib/demo/batches";
import { processTestTimeout, runProcess } from "../helpers/processes";
import { BatchPage } from "./pages/batch-page";
import { SignInPage } from "./pages/sign-in-page";

// Security settings of the production server (`next start` on 3410, built for production):
// headers on a page, an API route and a static asset; the session cookies; the refusal of the
// demo secrets at boot; another organisation's batch and file; hostile names on the page.
test.describe.configure({ mode: "serial" });

// Playwright runs from the repository root
const ROOT = process.cwd();
const CSV = barleyBatches()[0]!.csv;
const HOSTILE_FILE = "<img src=x onerror=window.__fileName=1>.csv";
const HOSTILE_LABEL = '=HYPERLINK("http://example.invalid","open") <img src=x onerror="window.__label=1">';
let batchId = "";

async function as(browser: Browser, email: string): Promise<Page> {
  const page = await (await browser.newContext()).newPage();
  await new SignInPage(page).signInAs(email);
  return page;
}

function expectSecurityHeaders(res: APIResponse, what: string) {
  const h = res.headers();
  const csp = h["content-security-policy"] ?? "";
  expect(csp, what).toContain("frame-ancestors 'none'");
  expect(csp, what).toContain("default-src 'self'");
  expect(csp, what).toContain("object-src 'none'");
  expect(csp, what).not.toContain("unsafe-eval");
  expect(h["x-content-type-options"], what).toBe("nosniff");
  expect(h["x-frame-options"], what).toBe("DENY");
  expect(h["referrer-policy"], what).toBe("strict-origin-when-cross-origin");
  expect(h["cross-origin-opener-policy"], what).toBe("same-origin");
  expect(h["strict-transport-security"], what).toMatch(/^max-age=\d{8,}/);
  expect(h["x-powered-by"], what).toBeUndefined();
}

test("a page, an API route and a static asset carry the security headers", async ({ request }) => {
  const page = await request.get("/sign-in");
  expect(page.status()).toBe(200);
  expectSecurityHeaders(page, "page");

  const api = await request.get("/api/v1/me");
  expect(api.status()).toBe(401);
  expectSecurityHeaders(api, "API route");

  const script = /<script[^>]+src="(\/_next\/static\/[^"]+\.js)"/.exec(await page.text())?.[1];
  expect(script, "a script of the sign-in page").toBeTruthy();
  const asset = await request.get(script!);
  expect(asset.status()).toBe(200);
  expectSecurityHeaders(asset, "static asset");
});

test("pages run only scripts carrying the request's nonce: one policy, a fresh nonce each time, every script tagged", async ({
  request,
  browser,
}) => {
  const nonces: string[] = [];
  // the sign-in page twice (a fresh nonce each time), and the reset page, which has no data of its
  // own: it must still be rendered per request, or its scripts would carry no nonce
  for (const url of ["/sign-in", "/sign-in", "/forgot-password"]) {
    const res = await request.get(url);
    const policies = res.headersArray().filter((h) => h.name.toLowerCase() === "content-security-policy");
    expect(policies, "one policy header on a page").toHaveLength(1);
    const scriptSrc = /script-src ([^;]+)/.exec(policies[0]!.value)?.[1] ?? "";
    // Next's guide: a per-request nonce and 'strict-dynamic'; never 'unsafe-inline' for scripts
    expect(scriptSrc).toMatch(/'nonce-[A-Za-z0-9+/=]{24,}' 'strict-dynamic'/);
    expect(scriptSrc).not.toContain("unsafe-inline");
    const nonce = /'nonce-([^']+)'/.exec(scriptSrc)![1]!;
    nonces.push(nonce);
    const tags = (await res.text()).match(/<script\b[^>]*>/g) ?? [];
    expect(tags.length).toBeGreaterThan(0);
    for (const tag of tags) expect(tag, tag).toContain(`nonce="${nonce}"`);
  }
  expect(nonces[0]).not.toBe(nonces[1]);

  // the app still runs under it: signing in (a client form) and a page with tables and charts,
  // with no script refused by the policy
  const refused: string[] = [];
  const page = await (await browser.newContext()).newPage();
  page.on("console", (m) => {
    if (/Content Security Policy|Refused to (execute|load)/i.test(m.text())) refused.push(m.text());
  });
  await page.goto("/forgot-password");
  await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
  await new SignInPage(page).signInAs("lead@lowmoor.test");
  await page.goto("/board");
  await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
  expect(refused).toEqual([]);
});

test("session cookies are HttpOnly and SameSite=Lax (plain http on loopback: not Secure)", async ({
  request,
}) => {
  const csrf = await request.get("/api/auth/csrf");
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const signIn = await request.post("/api/auth/callback/credentials", {
    form: { email: "lead@lowmoor.test", password: "tributary-demo", csrfToken, json: "true" },
    maxRedirects: 0,
  });
  const setCookies = [...csrf.headersArray(), ...signIn.headersArray()]
    .filter((h) => h.name.toLowerCase() === "set-cookie")
    .map((h) => h.value);
  const session = setCookies.find((c) => c.startsWith("next-auth.session-token="));
  expect(session, setCookies.join("\n")).toBeTruthy();
  for (const c of setCookies.filter((c) => c.startsWith("next-auth."))) {
    expect(c).toMatch(/;\s*HttpOnly/i);
    expect(c).toMatch(/;\s*SameSite=Lax/i);
    expect(c).toMatch(/;\s*Path=\//i);
  }
});

test("next start refuses to boot with the demo secrets when TRIBUTARY_DEMO is not 1", async () => {
  const env: Record<string, string> = { PATH: process.env.PATH ?? "", HOME: process.env.HOME ?? "/tmp" };
  for (const line of readFileSync(path.join(ROOT, ".env.example"), "utf8").split("\n")) {
    const m = /^([A-Z0-9_]+)=(.*)$/.exec(line.trim());
    if (m) env[m[1]!] = m[2]!;
  }
  // "0", not absent: an .env file beside the build would otherwise fill in the demo flag
  Object.assign(env, { NODE_ENV: "production", TRIBUTARY_DEMO: "0" });
  // the refusal ends the process: wait for its exit, however long a busy machine takes to boot next
  test.setTimeout(processTestTimeout());
  const { code, output } = await runProcess(
    path.join(ROOT, "node_modules/.bin/next"),
    ["start", "-H", "127.0.0.1", "-p", "3419"],
    { cwd: ROOT, env: env as NodeJS.ProcessEnv },
  );
  expect(code, output).not.toBeNull();
  expect(code, output).not.toBe(0);
  expect(output).toContain("refusing to start");
  expect(output).toMatch(
    /NEXTAUTH_SECRET: is a demo value published in this repository; set NEXTAUTH_SECRET to a secret of your own/,
  );
});

test("an upload with a hostile name and label shows both as text; no element is injected", async ({
  browser,
}) => {
  const page = await as(browser, "provider@fennick.test");
  const res = await page.request.post("/api/v1/batches", {
    multipart: {
      study: "barley-nitrogen",
      label: HOSTILE_LABEL,
      file: { name: HOSTILE_FILE, mimeType: "text/csv", buffer: Buffer.from(CSV) },
    },
  });
  expect(res.status(), await res.text()).toBe(201);
  batchId = ((await res.json()) as { data: { batchId: string } }).data.batchId;

  await page.goto(`/batches/${batchId}`);
  await expect(page.getByRole("heading", { level: 1 })).toContainText(
    '<img src=x onerror="window.__label=1">',
  );
  await expect(page.getByText("_img src=x onerror=window.__fileName=1_.csv")).toBeVisible();
  await expect(page.locator('img[src="x"]')).toHaveCount(0);
  expect(
    await page.evaluate(() => [
      (window as unknown as Record<string, unknown>).__label,
      (window as unknown as Record<string, unknown>).__fileName,
    ]),
  ).toEqual([undefined, undefined]);

  // the original file, linked from the page and named safely
  await expect(page.getByTestId("original-file")).toHaveAttribute(
    "href",
    `/api/v1/batches/${batchId}/versions/1/file`,
  );
  const file = await page.request.get(`/api/v1/batches/${batchId}/versions/1/file`);
  expect(file.status()).toBe(200);
  expect(file.headers()["content-disposition"]).toMatch(
    /^attachment; filename="[A-Za-z0-9._-]+"; filename\*=UTF-8''[A-Za-z0-9!#$&+.^_`|~%-]+$/,
  );
  expect(await file.text()).toBe(CSV);

  // the home table's CSV download keeps the formula-looking label as text
  await page.goto("/provider");
  // the innermost block holding both the "Recent batches" grid and its filter holds its button
  const recent = page
    .locator("div")
    .filter({ has: page.getByRole("grid", { name: "Recent batches" }) })
    .filter({ has: page.getByLabel("Filter Recent batches") })
    .last();
  const [download] = await Promise.all([
    page.waitForEvent("download"),
    recent.getByRole("button", { name: "Download CSV" }).click(),
  ]);
  expect(download.suggestedFilename()).toBe("recent-batches.csv");
  const csv = await readFile(await download.path(), "utf8");
  expect(csv).toContain(
    `"'=HYPERLINK(""http://example.invalid"",""open"") <img src=x onerror=""window.__label=1"">"`,
  );
  expect(csv).not.toMatch(/(^|,)"?=/m);
  await page.context().close();
});

test("a file chosen in the browser with markup and a right-to-left override in its name is stored clean and shown as text", async ({
  browser,
}) => {
  const page = await as(browser, "provider@fennick.test");
  await page.goto("/upload");
  const batch = new BatchPage(page);
  await batch.chooseFile("<img src=x onerror=window.__up=1>\u202Etxt.csv", CSV);
  // the check before upload names the file as chosen, as text
  await expect(batch.precheck).toBeVisible({ timeout: 60_000 });
  const id = await batch.upload();
  await expect(page.getByText("_img src=x onerror=window.__up=1_txt.csv")).toBeVisible();
  await expect(page.locator('img[src="x"]')).toHaveCount(0);
  expect(await page.evaluate(() => (window as unknown as Record<string, unknown>).__up)).toBeUndefined();
  const json = (await (await page.request.get(`/api/v1/batches/${id}`)).json()) as {
    data: { versions: { fileName: string }[] };
  };
  expect(json.data.versions[0]!.fileName).toBe("_img src=x onerror=window.__up=1_txt.csv");
  await page.context().close();
});

test("another organisation's provider and an analyst not assigned get 'Batch not found' and 404 for the file", async ({
  browser,
}) => {
  for (const email of ["provider@harrowgate.test", "analyst2@lowmoor.test"]) {
    const page = await as(browser, email);
    for (const url of [`/batches/${batchId}`, `/batches/${batchId}/trail`]) {
      await page.goto(url);
      await expect(page.getByRole("heading", { name: "Batch not found" }), `${email} ${url}`).toBeVisible();
      await expect(page.getByText("HYPERLINK")).toHaveCount(0);
    }
    for (const url of [
      `/api/v1/batches/${batchId}/versions/1/file`,
      `/api/v1/batches/${batchId}/versions/1/report`,
      `/api/v1/batches/${batchId}/versions/1/rows-at-fault`,
    ]) {
      expect((await page.request.get(url)).status(), `${email} ${url}`).toBe(404);
    }
    await page.context().close();
  }
});
