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
);
