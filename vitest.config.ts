import { defineConfig } from "vitest/config";
import path from "node:path";

const alias = {
  "@": path.resolve(import.meta.dirname),
  // server code imports "server-only", which throws outside a React server build
  "server-only": path.resolve(import.meta.dirname, "tests/helpers/server-only.ts"),
};

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: "unit",
          include: ["tests/unit/**/*.test.ts"],
          environment: "node",
          testTimeout: 60_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          environment: "node",
          testTimeout: 120_000,
          hookTimeout: 180_000,
          fileParallelism: false,
          globalSetup: ["tests/integration/global-setup.ts"],
          // each file gets its own copy of the seeded database
          setupFiles: ["tests/integration/isolate-db.ts"],
        },
      },
    ],
  },
});
