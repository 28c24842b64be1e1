import type { NextConfig } from "next";

const isDev = process.env.NODE_ENV !== "production";

/**
 * Content Security Policy. Scripts: Next's hydration data is inline, so 'unsafe-inline'
 * stays until pages carry nonces; dev mode also needs 'unsafe-eval' for fast refresh.
 * Styles: the table library (emotion) and sonner inject <style> tags at run time.
 */
const csp = [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline'${isDev ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  // uploads go to the upload service (the fake in the demo), on loopback ports
  `connect-src 'self'${isDev ? " ws: http://127.0.0.1:* http://localhost:*" : " http://127.0.0.1:* http://localhost:*"}`,
  "frame-ancestors 'none'",
  "form-action 'self'",
  "base-uri 'self'",
  "object-src 'none'",
  "worker-src 'self' blob:",
].join("; ");

const securityHeaders = [
  { key: "Content-Security-Policy", value: csp },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
  // no window another site opens can reach back into ours
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  // browsers heed it only over https (RFC 6797 §8.1), so the plain-http demo is unaffected
  ...(isDev ? [] : [{ key: "Strict-Transport-Security", value: "max-age=31536000; includeSubDomains" }]),
];

const nextConfig: NextConfig = {
  poweredByHeader: false,
  reactStrictMode: true,
  serverExternalPackages: ["mysql2", "bcryptjs"],
  async headers() {
    return [{ source: "/:path*", headers: securityHeaders }];
  },
};

export default nextConfig;
