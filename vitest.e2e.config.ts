import { defineConfig } from "vitest/config";

// End-to-end suites: each starts the built app with its own services and a browser, so they
// run one file at a time, with timeouts sized for a server start and a page load on 2 cores.
// The fault drills (tests/faults) run here too: they need the built app, a worker and
// services they can kill, and take minutes (40 s outages), which the quick unit run must not.
export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    include: ["tests/e2e/**/*.e2e.test.ts", "tests/faults/**/*.fault.test.ts"],
    environment: "node",
    fileParallelism: false,
    pool: "forks",
    testTimeout: 120_000,
    hookTimeout: 180_000,
    teardownTimeout: 30_000,
  },
});
