import { expect, type Page } from "@playwright/test";

/** One demo account of each role (README, "Using Tributary, role by role"). */
export const ROLE_ACCOUNTS = {
  provider: "provider@harrowgate.test",
  analyst: "analyst@lowmoor.test",
  lead: "lead@lowmoor.test",
  admin: "admin@tributary.test",
} as const;

/** Pages that take an id: the first link of each kind found on the role's own pages is walked too. */
const DYNAMIC = [
  /^\/batches\/[A-Za-z0-9_-]+$/,
  /^\/batches\/[A-Za-z0-9_-]+\/trail$/,
  /^\/batches\/[A-Za-z0-9_-]+\/new-version$/,
  /^\/pool\/[a-z0-9-]+$/,
  /^\/studies\/[a-z0-9-]+$/,
  /^\/studies\/[a-z0-9-]+\/plan$/,
  /^\/studies\/new$/,
  /^\/mailbox\/[^/]+$/,
];

/** Every same-origin path linked from the page's main content and its top bar. */
async function linksOn(page: Page): Promise<string[]> {
  return page.evaluate(() =>
    [...document.querySelectorAll<HTMLAnchorElement>("a[href^='/']")].map((a) => new URL(a.href).pathname),
  );
}

/**
 * Walks a signed-in role's pages: its home, every page of its navigation, then one page of each
 * kind that takes an id (a batch, its trail, a pool, a study, its plan, a message) when it links one.
 * `visit` runs on each page once it has loaded and hydrated.
 */
export async function walkRolePages(page: Page, visit: (path: string) => Promise<void>): Promise<string[]> {
  const seen: string[] = [];
  const open = async (path: string) => {
    await page.goto(path);
    await page.waitForLoadState("load");
    await expect(page.getByRole("heading", { level: 1 }).first()).toBeVisible();
    seen.push(path);
    await visit(path);
  };
  await page.goto("/");
  await page.waitForLoadState("load");
  const home = new URL(page.url()).pathname;
  const nav = await page
    .getByRole("navigation", { name: "Main" })
    .getByRole("link")
    .evaluateAll((as) => as.map((a) => new URL((a as HTMLAnchorElement).href).pathname));
  const found = new Set<string>();
  for (const path of [home, ...nav.filter((p) => p !== home)]) {
    await open(path);
    for (const l of await linksOn(page)) found.add(l);
  }
  for (const kind of DYNAMIC) {
    const path = [...found].find((l) => kind.test(l) && !seen.includes(l));
    if (!path) continue;
    await open(path);
    for (const l of await linksOn(page)) found.add(l);
  }
  return seen;
}
