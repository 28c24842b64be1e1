/**
 * The Content Security Policy, in one place for the proxy (pages, with a fresh nonce per
 * request) and next.config.ts (API answers and static files, which run no script).
 * Scripts: only those carrying the page's nonce, and what they load ('strict-dynamic'), as
 * Next's CSP guide recommends; dev mode adds 'unsafe-eval' for fast refresh. Styles keep
 * 'unsafe-inline': the table library (emotion) and sonner inject <style> tags at run time.
 */
export function contentSecurityPolicy(opts: { nonce?: string; dev: boolean }): string {
  const scripts = opts.nonce ? `'self' 'nonce-${opts.nonce}' 'strict-dynamic'` : "'self'";
  return [
    "default-src 'self'",
    `script-src ${scripts}${opts.dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    // uploads go to the upload service (the fake in the demo), on loopback ports
    `connect-src 'self'${opts.dev ? " ws:" : ""} http://127.0.0.1:* http://localhost:*`,
    "frame-ancestors 'none'",
    "form-action 'self'",
    "base-uri 'self'",
    "object-src 'none'",
    "worker-src 'self' blob:",
  ].join("; ");
}
