// Vitest projects: `unit` (pure code, no services), `integration` (real PostgreSQL and the
// fake SMTP server, started by scripts/test.mjs) and `e2e` (real Chromium against a built app).
import { defineConfig } from "vitest/config";
import path from "node:path";

// `server-only` throws outside React Server Components; in tests it is an empty module.
const alias = {
  "@": path.resolve(__dirname),
  "server-only": path.resolve(__dirname, "tests/support/empty-module.ts"),
};
const exclude = ["node_modules/**", ".next/**", ".data/**", "test-output/**"];

export default defineConfig({
  resolve: { alias },
  test: {
    projects: [
      {
        resolve: { alias },
        test: {
          name: "unit",
          environment: "node",
          sequence: { groupOrder: 0 },
          setupFiles: ["tests/support/fast-check-seed.ts"],
          include: ["tests/unit/**/*.test.ts"],
          exclude,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "integration",
          environment: "node",
          // Integration and browser tests share the demo team's data: run them one project after
          // the other, so that one's published release is not another's surprise.
          sequence: { groupOrder: 1 },
          include: ["tests/integration/**/*.test.ts"],
          exclude,
          fileParallelism: false,
          testTimeout: 60_000,
          hookTimeout: 120_000,
        },
      },
      {
        resolve: { alias },
        test: {
          name: "e2e",
          environment: "node",
          sequence: { groupOrder: 2 },
          include: ["tests/e2e/**/*.test.ts"],
          exclude,
          fileParallelism: false,
          testTimeout: 120_000,
          hookTimeout: 300_000,
        },
      },
    ],
  },
});
