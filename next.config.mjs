// @ts-check
import { contentSecurityPolicy } from "./lib/csp.js";

const isDev = process.env.NODE_ENV !== "production";

// Pages get their policy, with a fresh script nonce, from proxy.ts; what the proxy does not
// see (API answers, Next's static files, the favicon) gets the same policy without a nonce.
const staticCsp = contentSecurityPolicy({ dev: isDev });

const securityHeaders = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=()" },
  // no window another site opens can reach back into ours
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
  // browsers heed it only over https (RFC 6797 §8.1), so the plain-http demo is unaffected
  ...(isDev ? [] : [{ key: "Strict-Transport-Security", value: "max-age=31536000; includeSubDomains" }]),
];

/** @type {import('next').NextConfig} */
const nextConfig = {
  poweredByHeader: false,
  reactStrictMode: true,
  serverExternalPackages: ["mysql2", "bcryptjs"],
  async headers() {
    const cspHeader = [{ key: "Content-Security-Policy", value: staticCsp }];
    return [
      { source: "/:path*", headers: securityHeaders },
      ...["/api/:path*", "/_next/:path*", "/favicon.ico"].map((source) => ({ source, headers: cspHeader })),
    ];
  },
};

export default nextConfig;
