import { expect, type Locator, type Page } from "@playwright/test";

/** /admin/users: the users table and the create-user form. */
export class AdminUsersPage {
  readonly createForm: Locator;
  readonly filter: Locator;

  constructor(readonly page: Page) {
    this.createForm = page.getByRole("form", { name: "Create a user" });
    this.filter = page.getByRole("searchbox", { name: "Filter Users" });
  }

  async goto(): Promise<void> {
    await this.page.goto("/admin/users");
    await expect(this.page.getByRole("heading", { level: 1, name: "Users" })).toBeVisible();
  }

  async createUser(u: {
    name: string;
    email: string;
    roleLabel: string;
    organisation: string;
    password: string;
  }): Promise<void> {
    const f = this.createForm;
    await f.getByLabel("Name").fill(u.name);
    await f.getByLabel("E-mail").fill(u.email);
    await f.getByLabel("Role").selectOption({ label: u.roleLabel });
    await f.getByLabel("Organisation").selectOption({ label: u.organisation });
    await f.getByLabel("First password").fill(u.password);
    await f.getByRole("button", { name: "Create user" }).click();
  }

  /** The table row of one user, found by e-mail. */
  row(email: string): Locator {
    return this.page.getByRole("row").filter({ hasText: email });
  }

  async changeRole(email: string, roleLabel: string): Promise<void> {
    await this.page.getByRole("combobox", { name: `Role of ${email}` }).selectOption({ label: roleLabel });
  }

  async deactivate(email: string): Promise<void> {
    await this.page.getByRole("button", { name: `Deactivate ${email}` }).click();
  }

  async reactivate(email: string): Promise<void> {
    await this.page.getByRole("button", { name: `Reactivate ${email}` }).click();
  }

  toast(text: string | RegExp): Locator {
    return this.page.locator("[data-sonner-toast]").filter({ hasText: text });
  }
}
