import { spawnSync } from "node:child_process";
import { expect, test } from "../support/e2e";

function startServer(env: Record<string, string>) {
  return spawnSync("node", ["scripts/serve.js"], {
    env: { ...process.env, NODE_ENV: "production", PORT: String(Number(process.env.E2E_PORT ?? 3101) + 60), ...env },
    encoding: "utf8",
    timeout: 30_000,
  });
}

test.describe("starting the production server", () => {
  test("refuses to start without a session secret, naming the variable", () => {
    const run = startServer({ SESSION_SECRET: "" });
    expect(run.status).toBe(1);
    expect(run.stderr).toContain("SESSION_SECRET");
    expect(run.stderr).not.toMatch(/\n\s+at /);
  });

  test("refuses a malformed variable, naming it", () => {
    const run = startServer({ DB_PORT: "not-a-port" });
    expect(run.status).toBe(1);
    expect(run.stderr).toContain("DB_PORT");
  });
});
