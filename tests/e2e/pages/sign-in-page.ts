import { expect, type Browser, type Locator, type Page } from "@playwright/test";

export const DEMO_PASSWORD = "tributary-demo";
export const ROLE_HOME = /\/(provider|analyst|lead|admin)$/;

/** The sign-in form at /sign-in. */
export class SignInPage {
  readonly email: Locator;
  readonly password: Locator;
  readonly submit: Locator;
  readonly error: Locator;

  constructor(readonly page: Page) {
    this.email = page.getByLabel("E-mail");
    this.password = page.getByLabel("Password");
    this.submit = page.getByRole("button", { name: /sign in/i });
    this.error = page.locator("#sign-in-error");
  }

  async goto(): Promise<void> {
    await this.page.goto("/sign-in");
    await expect(this.page.getByRole("heading", { name: "Sign in" })).toBeVisible();
  }

  async signIn(email: string, password: string = DEMO_PASSWORD): Promise<void> {
    await this.email.fill(email);
    await this.password.fill(password);
    await this.submit.click();
  }

  /** Signs in and waits until the browser has landed, fully loaded, on a role's home. */
  async signInAs(email: string, password: string = DEMO_PASSWORD): Promise<void> {
    await this.goto();
    await this.signIn(email, password);
    // "/" redirects on the server, so the first settled page is the home itself
    await this.page.waitForURL(ROLE_HOME, { waitUntil: "load" });
  }
}

/** A page in a fresh browser context, signed in as `email` (the specs' usual first step). */
export async function signedIn(browser: Browser, email: string): Promise<Page> {
  const context = await browser.newContext();
  const page = await context.newPage();
  await new SignInPage(page).signInAs(email);
  return page;
}
