import { expect, type Locator, type Page } from "@playwright/test";

/** What every signed-in page has: the top bar with the user, the main navigation, sign-out. */
export class PortalPage {
  readonly user: Locator;
  readonly nav: Locator;
  readonly main: Locator;
  readonly heading: Locator;

  constructor(readonly page: Page) {
    this.user = page.getByTestId("signed-in-user");
    this.nav = page.getByRole("navigation", { name: "Main" });
    this.main = page.locator("main");
    this.heading = page.getByRole("heading", { level: 1 });
  }

  async expectSignedInAs(name: string, organisation?: string): Promise<void> {
    await expect(this.user).toContainText(name);
    if (organisation) await expect(this.user).toContainText(organisation);
  }

  /** A section of the page by its heading (level 2). */
  section(title: string | RegExp): Locator {
    return this.page
      .locator("section")
      .filter({ has: this.page.getByRole("heading", { level: 2, name: title }) });
  }

  async signOut(): Promise<void> {
    await this.page.getByRole("button", { name: "Sign out" }).click();
    await this.page.waitForURL("**/sign-in");
  }
}
