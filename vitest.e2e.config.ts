import { defineConfig } from "vitest/config";

// End-to-end suites: each starts the built app with its own services and a browser, so they
// run one file at a time, with timeouts sized for a server start and a page load on 2 cores.
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    include: ["tests/e2e/**/*.e2e.test.ts"],
    environment: "node",
    fileParallelism: false,
    pool: "forks",
    testTimeout: 120_000,
    hookTimeout: 180_000,
    teardownTimeout: 30_000,
  },
});
