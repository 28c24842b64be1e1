// @ts-check
/**
 * The Content Security Policy, in one place for the proxy (pages, with a fresh nonce per
 * request) and next.config.mjs (API answers and static files, which run no script). Plain
 * JavaScript with JSDoc types, because next.config.mjs is loaded by Node without a compiler.
 * Scripts: only those carrying the page's nonce, and what they load ('strict-dynamic'), as
 * Next's CSP guide recommends; dev mode adds 'unsafe-eval' for fast refresh. Styles keep
 * 'unsafe-inline': the table library (emotion) and sonner inject <style> tags at run time.
 */

/**
 * @param {{ nonce?: string; dev: boolean }} opts
 * @returns {string}
 */
export function contentSecurityPolicy(opts) {
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
