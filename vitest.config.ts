import { existsSync } from "node:fs";
import { defineConfig } from "vitest/config";

if (existsSync(".env")) process.loadEnvFile(".env");
const testDatabase = process.env.TEST_DB_NAME || "foamtally_test";

export default defineConfig({
  resolve: { tsconfigPaths: true },
  test: {
    include: ["app/**/*.test.ts", "tests/integration/**/*.test.ts", "scripts/**/*.test.ts"],
    setupFiles: ["tests/support/vitest-setup.ts"],
    globalSetup: ["tests/support/vitest-global-setup.ts"],
    // Mail from tests never reaches a demo's fake: nothing listens on the discard port.
    env: {
      DB_NAME: testDatabase,
      NODE_ENV: "test",
      SESSION_SECRET: "test-session-secret-0123456789abcdef",
      SMTP_URL: "smtp://127.0.0.1:9",
    },
    fileParallelism: false,
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
