import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";
import { calculatorCatalogue } from "./scripts/vite-plugins";

// Kept apart from vite.config.ts: the React Router plugin must not run under vitest.
export default defineConfig({
  plugins: [calculatorCatalogue()],
  resolve: {
    alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) },
  },
  test: {
    setupFiles: ["tests/support/fail-on-console-error.ts"],
    projects: [
      {
        extends: true,
        // Property tests run hundreds of cases; on a 2-core machine shared with a browser they can pass 5 s without being slow.
        test: { name: "unit", include: ["tests/unit/**/*.test.ts", "tests/unit/**/*.test.tsx"], environment: "node", testTimeout: 20_000 },
      },
      {
        extends: true,
        test: {
          name: "integration",
          include: ["tests/integration/**/*.test.ts"],
          environment: "node",
          setupFiles: ["tests/support/integration-db.ts"],
          testTimeout: 30_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
      {
        extends: true,
        test: {
          name: "e2e",
          include: ["tests/e2e/**/*.test.ts"],
          // No retries: a browser test that fails now and then has a cause to find, not a second chance.
          retry: 0,
          environment: "node",
          testTimeout: 60_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
