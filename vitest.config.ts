import { defineConfig } from "vitest/config";

// Kept apart from vite.config.ts: the reactRouter() plugin must not run under vitest.
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    include: ["tests/**/*.test.ts", "app/**/*.test.ts"],
    exclude: ["tests/e2e/**", "tests/faults/**", "node_modules/**"],
    environment: "node",
    testTimeout: 30_000,
    hookTimeout: 60_000,
    pool: "forks",
  },
});
