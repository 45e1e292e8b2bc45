import { spawn, type ChildProcess } from "node:child_process";
import { fakeMailDirectory, readFakeMailbox, smtpPort } from "../../app/lib/fake-mailbox.server";
import { DEMO, DEMO_PASSWORD, expect, test } from "../support/e2e";
import { testKnex } from "../support/test-database";

// Two more copies of the built app (scripts/serve.js) on ports of their own, against the one test
// database the main end-to-end server uses: what a proxy in front of several app servers sees. They
// trust X-Forwarded-For, as behind a proxy, so each story chooses its client's address.
const ports = [5, 6].map((offset) => Number(process.env.E2E_PORT ?? 3101) + offset);
const [serverA, serverB] = ports.map((port) => `http://127.0.0.1:${port}`);
const servers: ChildProcess[] = [];
const knex = testKnex();
const mailTag = `Two servers ${Date.now()}`;
const MAIL_COUNT = 12;

async function waitUntilUp(base: string) {
  for (let attempt = 0; attempt < 150; attempt++) {
    if (
      await fetch(`${base}/sign-in`).then(
        (response) => response.ok,
        () => false,
      )
    )
      return;
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  throw new Error(`${base} did not start`);
}

test.beforeAll(async () => {
  // Queued before either server starts, so that both senders find the same messages due at once.
  for (let i = 0; i < MAIL_COUNT; i++) {
    await knex("mail_outbox").insert({
      kind: "returned_report",
      to_addresses: "crew@alderbend.example",
      subject: `${mailTag} #${i}`,
      text_body: "Sent by whichever app server claimed it first (demo).",
    });
  }
  for (const port of ports) {
    servers.push(
      spawn("node", ["scripts/serve.js"], {
        env: {
          ...process.env,
          PORT: String(port),
          NODE_ENV: "production",
          DB_NAME: process.env.TEST_DB_NAME || "foamtally_test",
          APP_URL: `http://127.0.0.1:${port}`,
          TRUST_PROXY: "true",
          DEMO_MODE: "true",
        },
        stdio: "ignore",
      }),
    );
  }
  await Promise.all([serverA, serverB].map(waitUntilUp));
});

test.afterAll(async () => {
  for (const server of servers) server.kill("SIGTERM");
  await knex.destroy();
});

async function signInOn(base: string, email: string, password: string, address: string) {
  return fetch(`${base}/sign-in`, {
    method: "POST",
    redirect: "manual",
    headers: {
      "Content-Type": "application/x-www-form-urlencoded",
      Origin: base,
      "X-Forwarded-For": address,
    },
    body: new URLSearchParams({ email, password }),
  });
}

async function me(base: string, cookie: string) {
  return fetch(`${base}/api/me`, { headers: { Cookie: cookie } });
}

test.describe("two app servers, one database", () => {
  test("a session made on one works on the other, and signing out on either ends it on both", async () => {
    const signedIn = await signInOn(serverA, DEMO.officer, DEMO_PASSWORD, "10.60.0.1");
    expect(signedIn.status).toBe(302);
    const cookie = signedIn.headers.get("set-cookie")!.split(";")[0];
    expect((await me(serverB, cookie)).status).toBe(200);
    expect(await (await me(serverB, cookie)).json()).toMatchObject({ email: DEMO.officer });

    const out = await fetch(`${serverB}/sign-out`, {
      method: "POST",
      redirect: "manual",
      headers: { Cookie: cookie, Origin: serverB, "Content-Type": "application/x-www-form-urlencoded" },
      body: "",
    });
    expect(out.status).toBe(302);
    expect((await me(serverA, cookie)).status).toBe(401);
    expect((await me(serverB, cookie)).status).toBe(401);
  });

  test("failed sign-ins count across both servers", async () => {
    const email = `nobody-${Date.now()}@alderbend.example`;
    // Five failures, alternating servers and addresses: only the account's own count can add up.
    for (let i = 0; i < 5; i++) {
      const response = await signInOn(i % 2 ? serverB : serverA, email, "wrong guess", `10.61.0.${i}`);
      expect(response.status).toBe(400);
    }
    for (const base of [serverA, serverB]) {
      const throttled = await signInOn(base, email, "another guess", "10.61.1.1");
      expect(throttled.status).toBe(429);
      expect(Number(throttled.headers.get("retry-after"))).toBeGreaterThan(0);
      expect(await throttled.text()).toContain("Too many failed sign-ins");
    }
  });

  test("a catalogue change on one is seen by the other at once", async ({ page }) => {
    // Cookies belong to the host, not the port: one browser signed in on A is signed in on B too.
    await page.goto(`${serverA}/sign-in`);
    await page.getByLabel("Email").fill(DEMO.environmental);
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("navigation", { name: "Main" })).toBeVisible();

    await page.goto(`${serverA}/products/new`);
    const name = `Two-server Class A ${Date.now()} (test)`;
    await page.getByLabel("Name", { exact: true }).fill(name);
    await page.getByLabel("Foam class").selectOption("A");
    await page.getByLabel("Type").selectOption({ index: 1 });
    await page.getByLabel("Nominal percentages").fill("0.3");
    // Retired at once, so the stories that pick a concentrate on a report see only the demo products.
    await page.getByLabel(/^Active/).uncheck();
    await page.getByRole("button", { name: "Add product" }).click();
    await expect(page.getByRole("status")).toContainText(`Saved ${name}.`);

    await page.goto(`${serverB}/products`);
    await expect(page.getByRole("row").filter({ hasText: name })).toContainText("Retired");
  });

  test("queued mail is delivered once, whichever server sends it", async () => {
    const directory = fakeMailDirectory(smtpPort(process.env.SMTP_URL ?? "smtp://127.0.0.1:2525"));
    await expect
      .poll(
        async () =>
          Number(
            (
              await knex("mail_outbox")
                .where("subject", "like", `${mailTag}%`)
                .where("status", "sent")
                .count({ n: "*" })
            )[0].n,
          ),
        { timeout: 45_000, intervals: [500] },
      )
      .toBe(MAIL_COUNT);
    const received = (await readFakeMailbox(directory, 2000)).filter((message) => message.subject.startsWith(mailTag));
    expect(received).toHaveLength(MAIL_COUNT);
    expect(new Set(received.map((message) => message.subject)).size).toBe(MAIL_COUNT);
    const attempts = await knex("mail_outbox").where("subject", "like", `${mailTag}%`).pluck("attempts");
    expect(attempts.every((count: number) => count === 1)).toBe(true);
  });
});
