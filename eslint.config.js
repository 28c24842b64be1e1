import { readFileSync } from "node:fs";
import tseslint from "typescript-eslint";

// The house's boundaries, as import rules (DEVELOPERS.md "Where things go").

// The readiness engine is a library: it runs in Node, workers, the browser and the CLI.
// It must not reach into the framework, the database or any other part of the app.
const engineBoundary = {
  patterns: [
    {
      group: ["next", "next/*", "react", "react/*", "react-dom", "react-dom/*"],
      message: "lib/readiness is framework-free.",
    },
    {
      group: ["drizzle-orm", "drizzle-orm/*", "mysql2", "mysql2/*", "next-auth", "next-auth/*"],
      message: "lib/readiness never touches the database or auth.",
    },
    {
      group: ["server-only", "**/db/*", "**/app/*", "**/components/*"],
      message: "lib/readiness imports only itself and pure libraries.",
    },
    {
      regex: "^@/(?!lib/readiness(/|$))",
      message: "lib/readiness imports only itself and pure libraries, nothing of the app.",
    },
  ],
};

// Everything outside the engine imports it through its public entries, the ones
// lib/readiness/package.json exports: "@/lib/readiness" and its subpaths (e.g. "@/lib/readiness/node",
// Node only). To make a module public, add it to those "exports". Unit tests of the engine's own
// modules (tests/unit, tests/helpers) may reach inside.
const enginePackage = JSON.parse(
  readFileSync(new URL("./lib/readiness/package.json", import.meta.url), "utf8"),
);
const publicSubpaths = Object.keys(enginePackage.exports)
  .filter((k) => k !== "." && k !== "./package.json")
  .map((k) => k.slice(2));
const enginePublic = {
  group: [
    "@/lib/readiness/*",
    "**/lib/readiness/*",
    "@tributary/readiness/*",
    ...publicSubpaths.flatMap((p) => [
      `!@/lib/readiness/${p}`,
      `!**/lib/readiness/${p}`,
      `!@tributary/readiness/${p}`,
    ]),
  ],
  message: `Import the engine through its public entries (@/lib/readiness${publicSubpaths.map((p) => `, @/lib/readiness/${p}`).join("")}): export what you need from lib/readiness/index.ts, or list the module in lib/readiness/package.json "exports".`,
};

// The demo scenario seeds the demo and feeds tests and scripts; the product never depends on it.
const noDemo = {
  regex: "^@/lib/demo(/|$)",
  message: "Production code never imports lib/demo (it is the invented demo scenario).",
};

// Pages and components show data; they read it through a feature's queries, never from the database.
const noDatabase = {
  group: ["@/db/client", "@/db/migrate", "@/db/seed", "drizzle-orm", "drizzle-orm/*", "mysql2", "mysql2/*"],
  message:
    "Pages and components never touch the database: call a feature's read (lib/<feature>/queries*.ts) instead.",
};

// Feature folders: each imports another only through its public index.ts.
const FEATURES = ["batches", "studies", "people", "pool", "mail"];
const featureBoundary = (self) => {
  const others = FEATURES.filter((f) => f !== self).join("|");
  return [
    {
      regex: `^@/lib/(${others})/`,
      message: `lib/${self} imports another feature only through its index: @/lib/<feature>, not a file inside it.`,
    },
    {
      regex: `^(\\.\\./)+(${others})(/|$)`,
      message: `lib/${self} imports another feature as @/lib/<feature> (its index).`,
    },
    noDemo,
    enginePublic,
  ];
};

export default tseslint.config(
  {
    ignores: [
      ".next/**",
      "node_modules/**",
      "drizzle/**",
      ".data/**",
      "next-env.d.ts",
      "bench-out/**",
      "lib/readiness/.build/**",
    ],
  },
  ...tseslint.configs.recommended,
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    files: ["lib/readiness/**/*.ts"],
    rules: { "no-restricted-imports": ["error", engineBoundary] },
  },
  // everything outside the engine (and the engine's own unit tests) goes through its public entries
  {
    files: ["**/*.{ts,tsx,js,mjs,cjs}"],
    ignores: ["lib/readiness/**", "tests/unit/**", "tests/helpers/**"],
    rules: { "no-restricted-imports": ["error", { patterns: [enginePublic] }] },
  },
  // production code outside the features: the app, components, the shared lib folders, the proxy
  {
    files: [
      "app/**/*.{ts,tsx}",
      "components/**/*.{ts,tsx}",
      "lib/**/*.{ts,tsx}",
      "proxy.ts",
      "instrumentation.ts",
      "db/client.ts",
    ],
    ignores: ["lib/readiness/**", "lib/demo/**", ...FEATURES.map((f) => `lib/${f}/**`)],
    rules: { "no-restricted-imports": ["error", { patterns: [noDemo, enginePublic] }] },
  },
  {
    files: ["app/**/page.tsx", "app/**/layout.tsx", "components/**/*.{ts,tsx}"],
    rules: { "no-restricted-imports": ["error", { patterns: [noDatabase, noDemo, enginePublic] }] },
  },
  ...FEATURES.map((f) => ({
    files: [`lib/${f}/**/*.ts`],
    rules: { "no-restricted-imports": ["error", { patterns: featureBoundary(f) }] },
  })),
);
