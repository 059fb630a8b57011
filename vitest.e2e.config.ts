// Browser tests of the built site (npm run test:e2e). Not part of `npm test`: they need
// Debian's chromium at /usr/bin/chromium and take several seconds.
import { defineConfig } from "vitest/config";

export default defineConfig({
  test: {
    include: ["test/e2e/**/*.e2e.ts"],
    testTimeout: 60_000,
    hookTimeout: 120_000,
    fileParallelism: false,
  },
});
