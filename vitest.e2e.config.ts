import { defineConfig } from "vitest/config";
import path from "node:path";

// Browser tests: one built app on loopback (started in global setup), Debian chromium via playwright-core.
export default defineConfig({
  resolve: { alias: { "@": path.resolve(import.meta.dirname) } },
  test: {
    include: ["tests/e2e/**/*.e2e.ts"],
    globalSetup: ["tests/e2e/global-setup.ts"],
    testTimeout: 90_000,
    hookTimeout: 240_000,
    fileParallelism: false,
    pool: "forks",
  },
});
