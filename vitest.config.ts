import { defineConfig } from "vitest/config";
import { fileURLToPath } from "node:url";

// Unit and integration tests. The e2e suite has its own config (tests/e2e/vitest.config.ts).
export default defineConfig({
  resolve: { alias: { "~": fileURLToPath(new URL("./app", import.meta.url)) } },
  test: {
    // Component tests (*.test.tsx) pick their DOM themselves: `// @vitest-environment happy-dom` on their first line.
    include: ["app/**/*.test.ts", "app/**/*.test.tsx", "tests/integration/**/*.test.ts", "fakes/**/*.test.ts", "scripts/**/*.test.ts", "demo/**/*.test.ts"],
    environment: "node",
    testTimeout: 60_000,
    hookTimeout: 120_000,
    pool: "forks",
    maxWorkers: 2,
  },
});
