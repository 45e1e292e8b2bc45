import { spawn, type ChildProcess } from "node:child_process";
import { startTcpProxy } from "../support/tcp-proxy";
import { DEMO, DEMO_PASSWORD, expect, test } from "../support/e2e";

// A second copy of the app whose database connection runs through a proxy the test can cut.
const port = Number(process.env.E2E_PORT ?? 3101) + 50;
const base = `http://127.0.0.1:${port}`;
let proxy: Awaited<ReturnType<typeof startTcpProxy>>;
let server: ChildProcess;

test.beforeAll(async () => {
  proxy = await startTcpProxy({ host: "127.0.0.1", port: Number(process.env.DB_PORT ?? 3307) });
  server = spawn("node", ["scripts/serve.js"], {
    env: {
      ...process.env,
      PORT: String(port),
      NODE_ENV: "production",
      DB_PORT: String(proxy.port),
      DB_NAME: process.env.TEST_DB_NAME || "foamtally_test",
    },
    stdio: "pipe",
  });
  for (let attempt = 0; attempt < 100; attempt++) {
    const up = await fetch(`${base}/sign-in`).then(
      () => true,
      () => false,
    );
    if (up) return;
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  throw new Error("the second app did not start");
});

test.afterAll(async () => {
  server?.kill("SIGTERM");
  await proxy?.stop();
});

test.describe("when the database stops answering", () => {
  test("a report being typed is kept, with a plain message, and saves once the database is back", async ({
    page,
    consoleErrors,
  }) => {
    consoleErrors.allow(/status of 503/);
    await page.goto(`${base}/sign-in`);
    await page.getByLabel("Email").fill(DEMO.officer);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("navigation", { name: "Main" })).toBeVisible();
    await page.goto(`${base}/events/new`);
    const number = `OUTAGE-${Date.now()}`;
    await page.getByLabel("Event number").fill(number);
    await page.getByLabel("Address or location").fill("12 Outage Lane (demo)");
    await page.getByRole("listitem", { name: "Discharge 1" }).getByLabel("Flow", { exact: true }).fill("150");

    await proxy.cut();
    await page.getByRole("button", { name: "Save draft" }).click();
    await expect(page.getByRole("alert")).toContainText("records database is not answering");
    await expect(page.getByLabel("Event number")).toHaveValue(number);
    await expect(page.getByLabel("Address or location")).toHaveValue("12 Outage Lane (demo)");
    await expect(page.getByRole("listitem", { name: "Discharge 1" }).getByLabel("Flow", { exact: true })).toHaveValue(
      "150",
    );

    const api = await page.request.get(`${base}/api/me`);
    expect(api.status()).toBe(503);
    expect(await api.json()).toEqual({ error: expect.stringContaining("not answering") });

    await proxy.restore();
    await page.getByRole("button", { name: "Save draft" }).click();
    await expect(page.getByRole("status")).toHaveText(/Draft saved/);
    await expect(page.getByLabel("Event number")).toHaveValue(number);
  });

  test("a page asked for during the outage says so plainly, without a stack trace", async ({ page, consoleErrors }) => {
    consoleErrors.allow(/status of 503/);
    await page.goto(`${base}/sign-in`);
    await page.getByLabel("Email").fill(DEMO.chief);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("navigation", { name: "Main" })).toBeVisible();
    await proxy.cut();
    try {
      const response = await page.goto(`${base}/events`);
      expect(response?.status()).toBe(503);
      await expect(page.getByRole("heading", { name: "Temporarily unavailable" })).toBeVisible();
      await expect(page.locator("body")).toContainText("not answering");
      await expect(page.locator("body")).not.toContainText(/\bat \S+ \(|node_modules|Error:/);
    } finally {
      await proxy.restore();
    }
  });

  test("signing in during the outage keeps the email and explains", async ({ page, consoleErrors }) => {
    consoleErrors.allow(/status of 503/);
    await proxy.cut();
    try {
      await page.goto(`${base}/sign-in`);
      await page.getByLabel("Email").fill(DEMO.records);
      await page.getByLabel("Password").fill(DEMO_PASSWORD);
      await page.getByRole("button", { name: "Sign in" }).click();
      await expect(page.getByRole("alert")).toContainText("not answering");
      await expect(page.getByLabel("Email")).toHaveValue(DEMO.records);
    } finally {
      await proxy.restore();
    }
  });
});
