// Browser tests of the built site (npm run test:e2e). Not part of `npm test`: they need
// Debian's chromium at /usr/bin/chromium and take several seconds.
import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    include: ["test/e2e/**/*.e2e.ts"],
    // one demo build shared by every browser test file (see test/e2e/globalSetup.ts)
    globalSetup: ["test/e2e/globalSetup.ts"],
    testTimeout: 60_000,
    hookTimeout: 180_000,
    fileParallelism: false,
  },
});
