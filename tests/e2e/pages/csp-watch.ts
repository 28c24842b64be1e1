import type { Page } from "@playwright/test";

/**
 * Collects what the browser reports as blocked by the Content-Security-Policy and any
 * uncaught page error, so a test can assert the page ran cleanly under the real headers.
 */
export function watchPageProblems(page: Page): { problems: string[] } {
  const problems: string[] = [];
  page.on("console", (msg) => {
    const text = msg.text();
    if (
      msg.type() === "error" &&
      /Content Security Policy|Refused to (load|apply|execute|connect)/i.test(text)
    ) {
      problems.push(`CSP: ${text}`);
    }
  });
  page.on("pageerror", (err) => problems.push(`page error: ${err.message}`));
  return { problems };
}
