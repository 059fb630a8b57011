import { defineConfig } from "vitest/config";

// Unit and integration tests (`npm test`). Browser tests live in test/e2e (*.e2e.ts) and run
// with vitest.e2e.config.ts. Some tests read the whole demo portfolio or build a small site,
// which takes seconds on a busy 2-core machine, hence the generous per-test limit.
export default defineConfig({
  test: {
    include: ["test/**/*.test.ts"],
    // fast-check: a fixed seed under CI, fresh values locally (test/setup/fastCheck.ts)
    setupFiles: ["test/setup/fastCheck.ts"],
    testTimeout: 60_000,
    hookTimeout: 60_000,
  },
});
