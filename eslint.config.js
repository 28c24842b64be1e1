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
// lib/readiness/package.json exports: "@/lib/readiness" and "@/lib/readiness/node" (Node only).
// Unit tests of the engine's own modules (tests/unit, tests/helpers) may reach inside.
const engineEntries = {
  patterns: [
    {
      group: ["@/lib/readiness/*", "!@/lib/readiness/node", "**/lib/readiness/*", "!**/lib/readiness/node", "@tributary/readiness/*", "!@tributary/readiness/node"],
      message: "Import the engine through its public entry, @/lib/readiness (or @/lib/readiness/node for Node-only helpers); export what you need from lib/readiness/index.ts.",
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
