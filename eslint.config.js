import { readFileSync } from "node:fs";
import tseslint from "typescript-eslint";

// The readiness engine is a library: it runs in Node, workers, the browser and the CLI.
// It must not reach into the framework or the database.
const engineBoundary = {
  patterns: [
    { group: ["next", "next/*", "react", "react/*", "react-dom", "react-dom/*"], message: "lib/readiness is framework-free." },
    { group: ["drizzle-orm", "drizzle-orm/*", "mysql2", "mysql2/*", "next-auth", "next-auth/*"], message: "lib/readiness never touches the database or auth." },
    { group: ["@/db", "@/db/*", "**/db/*", "@/app/*", "@/components/*", "@/lib/dal/*", "server-only"], message: "lib/readiness imports only itself and pure libraries." },
  ],
};

// Everything outside the engine imports it through its public entries, the ones
// lib/readiness/package.json exports: "@/lib/readiness" and its subpaths (e.g. "@/lib/readiness/node",
// Node only). To make a module public, add it to those "exports". Unit tests of the engine's own
// modules (tests/unit, tests/helpers) may reach inside.
const enginePackage = JSON.parse(readFileSync(new URL("./lib/readiness/package.json", import.meta.url), "utf8"));
const publicSubpaths = Object.keys(enginePackage.exports)
  .filter((k) => k !== "." && k !== "./package.json")
  .map((k) => k.slice(2));
const engineEntries = {
  patterns: [
    {
      group: [
        "@/lib/readiness/*",
        "**/lib/readiness/*",
        "@tributary/readiness/*",
        ...publicSubpaths.flatMap((p) => [`!@/lib/readiness/${p}`, `!**/lib/readiness/${p}`, `!@tributary/readiness/${p}`]),
      ],
      message: `Import the engine through its public entries (@/lib/readiness${publicSubpaths.map((p) => `, @/lib/readiness/${p}`).join("")}): export what you need from lib/readiness/index.ts, or list the module in lib/readiness/package.json "exports".`,
    },
  ],
};

export default tseslint.config(
  { ignores: [".next/**", "node_modules/**", "drizzle/**", ".data/**", "next-env.d.ts", "bench-out/**"] },
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
  {
    files: ["**/*.{ts,tsx,js,mjs,cjs}"],
    ignores: ["lib/readiness/**", "tests/unit/**", "tests/helpers/**"],
    rules: { "no-restricted-imports": ["error", engineEntries] },
  },
);
