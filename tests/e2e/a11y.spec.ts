import AxeBuilder from "@axe-core/playwright";
import { expect, test } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";
import { ROLE_ACCOUNTS, walkRolePages } from "./pages/walk";

/**
 * The accessibility scan: axe-core (Deque's rules for WCAG 2.1 A/AA and best practice) on every
 * page each role reaches, in the light and the dark colour scheme. No violation of impact
 * "serious" or "critical" is allowed (axe's own impact scale; colour contrast is "serious").
 */

type Found = { path: string; scheme: string; rule: string; impact: string; help: string; targets: string[] };

async function scan(page: import("@playwright/test").Page, path: string, scheme: string): Promise<Found[]> {
  // a switch of colour scheme starts the buttons' colour transitions (transition-colors): they are
  // taken to their end at once, so that axe reads the colours they end at, not one in between (a
  // retry-only contrast failure on /settings, dark). Waiting for them to finish instead hung on
  // one of the lead's pages.
  await page.evaluate(() => {
    for (const a of document.getAnimations())
      if (a instanceof CSSTransition) {
        try {
          a.finish();
        } catch {
          // an animation that cannot be finished (none expected among transitions) is left as it is
        }
      }
  });
  const result = await new AxeBuilder({ page }).options({ resultTypes: ["violations"] }).analyze();
  return result.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map((v) => ({
      path,
      scheme,
      rule: v.id,
      impact: v.impact ?? "",
      help: v.help,
      targets: v.nodes.slice(0, 5).map((n) => n.target.join(" ")),
    }));
}

test("the sign-in page has no serious or critical accessibility violation, light or dark", async ({
  page,
}) => {
  await new SignInPage(page).goto();
  const found: Found[] = [];
  for (const scheme of ["light", "dark"] as const) {
    await page.emulateMedia({ colorScheme: scheme });
    found.push(...(await scan(page, "/sign-in", scheme)));
  }
  expect(found, JSON.stringify(found, null, 2)).toEqual([]);
});

test("the API reference page has no serious or critical accessibility violation, light or dark", async ({
  page,
}) => {
  await page.goto("/api-reference");
  // scan once the viewer has drawn the document (its title and first operation), not its loading line
  await expect(page.getByRole("heading", { name: "Tributary API" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "This document." })).toBeVisible();
  const found: Found[] = [];
  for (const scheme of ["light", "dark"] as const) {
    await page.emulateMedia({ colorScheme: scheme });
    found.push(...(await scan(page, "/api-reference", scheme)));
  }
  expect(found, JSON.stringify(found, null, 2)).toEqual([]);
});

for (const [role, email] of Object.entries(ROLE_ACCOUNTS)) {
  test(`every page of the ${role} has no serious or critical accessibility violation, light or dark`, async ({
    page,
  }) => {
    test.setTimeout(600_000);
    await new SignInPage(page).signInAs(email);
    const found: Found[] = [];
    const seen = await walkRolePages(page, async (path) => {
      for (const scheme of ["light", "dark"] as const) {
        await page.emulateMedia({ colorScheme: scheme });
        found.push(...(await scan(page, path, scheme)));
      }
      await page.emulateMedia({ colorScheme: "light" });
    });
    // the walk reached the role's pages that take an id: a batch page for every role, a pool where the role has one
    expect(seen.some((p) => /^\/batches\/[^/]+$/.test(p))).toBe(true);
    if (role !== "provider") expect(seen.some((p) => /^\/pool\/[^/]+$/.test(p))).toBe(true);
    expect(found, JSON.stringify(found, null, 2)).toEqual([]);
  });
}
