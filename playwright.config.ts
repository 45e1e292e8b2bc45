import { existsSync } from "node:fs";
import { defineConfig } from "@playwright/test";

if (existsSync(".env")) process.loadEnvFile(".env");
const port = Number(process.env.E2E_PORT ?? 3101);
const baseURL = `http://127.0.0.1:${port}`;

export default defineConfig({
  testDir: "tests/e2e",
  outputDir: `test-results/e2e-${port}`,
  fullyParallel: false,
  workers: 1,
  retries: 0,
  timeout: 60_000,
  expect: { timeout: 10_000 },
  reporter: [["list"]],
  use: {
    baseURL,
    trace: "retain-on-failure",
    launchOptions: {
      executablePath: "/usr/bin/chromium",
      args: [
        "--no-sandbox",
        "--disable-gpu",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--no-first-run",
        "--disable-quic",
      ],
    },
  },
  webServer: {
    command: "node scripts/serve.js",
    url: `${baseURL}/sign-in`,
    reuseExistingServer: false,
    timeout: 60_000,
    env: {
      PORT: String(port),
      NODE_ENV: "production",
      DB_NAME: process.env.TEST_DB_NAME || "foamtally_test",
      APP_URL: baseURL,
      DEMO_MODE: "true",
    },
  },
});
