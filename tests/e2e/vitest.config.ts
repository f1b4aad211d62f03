import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

// The e2e suite runs against the built server started by scripts/test.ts (E2E base URL in APP_URL).
export default defineConfig({
  resolve: { alias: { "~": fileURLToPath(new URL("../../app", import.meta.url)) } },
  test: {
    include: ["tests/e2e/**/*.e2e.test.ts"],
    testTimeout: 120_000,
    hookTimeout: 120_000,
    pool: "forks",
    maxWorkers: 1,
    fileParallelism: false,
  },
});
