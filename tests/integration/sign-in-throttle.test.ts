import { describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import {
  delayAfterFailures,
  FIRST_DELAY_SECONDS,
  FREE_FAILURES_PER_ACCOUNT,
  FREE_FAILURES_PER_KNOWN_PAIR,
  MAX_DELAY_SECONDS,
  recordSignInFailure,
  signInWaitSeconds,
} from "~/lib/sign-in-throttle.server";
import { action as signInAction } from "~/routes/sign-in";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, routeArgs, settle } from "../support/requests";

async function attempt(email: string, password: string, address: string) {
  const request = formRequest("/sign-in", { email, password }, { "x-foamtally-client-address": address });
  return (await settle(() => signInAction(routeArgs(request)))).value;
}

function statusOf(value: unknown): number {
  return value instanceof Response ? value.status : ((value as { init?: { status?: number } }).init?.status ?? 200);
}

/** Lets every wait run out at once, as if the person came back later. */
async function letWaitsRunOut() {
  await db("sign_in_limits")
    .where("key", "like", "wait-%")
    .update({ expire: Date.now() - 1 });
}

// Each attempt checks a password at the production bcrypt cost; on a loaded machine a run of them
// takes longer than the default limit.
describe("sign-in throttling", { timeout: 120_000 }, () => {
  it("grows the wait with each failure past the free ones, up to a ceiling", () => {
    const waits = [4, 5, 6, 7, 8, 9, 10, 30].map((n) => delayAfterFailures(n, 5));
    expect(waits).toEqual([0, 30, 60, 120, 240, 480, 900, 900]);
    expect(MAX_DELAY_SECONDS).toBe(900);
  });

  it("answers a throttled attempt with 429, Retry-After and a message at the form, without checking the password", async () => {
    const user = await makeUser(["officer"]);
    for (let i = 0; i < FREE_FAILURES_PER_ACCOUNT; i++) await attempt(user.email, "wrong guess", `10.20.0.${i}`);
    const refused = await attempt(user.email, TEST_PASSWORD, "10.20.1.1");
    expect(statusOf(refused)).toBe(429);
    const init = (refused as { init: { headers: Record<string, string> } }).init;
    const retryAfter = Number(init.headers["Retry-After"]);
    expect(retryAfter).toBeGreaterThan(FIRST_DELAY_SECONDS - 5);
    expect(retryAfter).toBeLessThanOrEqual(FIRST_DELAY_SECONDS);
    const reply = (refused as { data: { result: { error: Record<string, string[]> } } }).data.result;
    expect(reply.error[""][0]).toMatch(/^Too many failed sign-ins .* Wait \d+ seconds, then try again\.$/);
    // The refused attempt was not a guess: it neither failed again nor signed in.
    expect(
      await db("audit_events")
        .where({ action: "sign_in", entity_id: String(user.id) })
        .count({ n: "*" }),
    ).toEqual([{ n: 0 }]);
  });

  it("slows rather than locks out: the wait doubles, and once it has passed the right password works", async () => {
    const user = await makeUser(["officer"]);
    for (let i = 0; i < FREE_FAILURES_PER_ACCOUNT; i++) await recordSignInFailure(user.email, `10.21.0.${i}`);
    const first = await signInWaitSeconds(user.email, "10.21.9.9");
    await recordSignInFailure(user.email, "10.21.1.1");
    const second = await signInWaitSeconds(user.email, "10.21.9.9");
    await recordSignInFailure(user.email, "10.21.1.2");
    const third = await signInWaitSeconds(user.email, "10.21.9.9");
    expect(first).toBeLessThanOrEqual(30);
    expect(second).toBeGreaterThan(first);
    expect(third).toBeGreaterThan(second);
    expect(third).toBeLessThanOrEqual(120);
    await letWaitsRunOut();
    expect(statusOf(await attempt(user.email, TEST_PASSWORD, "10.21.9.9"))).toBe(302);
  });

  it("lets the owner sign in from their usual address while the account is attacked from elsewhere", async () => {
    const user = await makeUser(["officer"]);
    const home = "10.22.0.1";
    expect(statusOf(await attempt(user.email, TEST_PASSWORD, home))).toBe(302);
    for (let i = 0; i < FREE_FAILURES_PER_ACCOUNT + 3; i++) await attempt(user.email, "attacker guess", `10.22.1.${i}`);
    expect(statusOf(await attempt(user.email, TEST_PASSWORD, "10.22.2.1"))).toBe(429);
    expect(statusOf(await attempt(user.email, TEST_PASSWORD, home))).toBe(302);
  });

  it("still slows guessing from the usual address, on a looser count of its own", async () => {
    const user = await makeUser(["officer"]);
    const home = "10.23.0.1";
    expect(statusOf(await attempt(user.email, TEST_PASSWORD, home))).toBe(302);
    for (let i = 0; i < FREE_FAILURES_PER_KNOWN_PAIR - 1; i++) await attempt(user.email, "typo", home);
    expect(await signInWaitSeconds(user.email, home)).toBe(0);
    await attempt(user.email, "typo", home);
    expect(await signInWaitSeconds(user.email, home)).toBeGreaterThan(0);
    expect(statusOf(await attempt(user.email, TEST_PASSWORD, home))).toBe(429);
  });

  it("keeps no email or address in the table, only hashes", async () => {
    const email = "hashed-key@test.example";
    await recordSignInFailure(email, "10.24.0.1");
    const keys = await db("sign_in_limits").pluck("key");
    expect(keys.some((key: string) => key.includes("hashed-key") || key.includes("10.24.0.1"))).toBe(false);
    expect(keys.every((key: string) => /^[a-z-]+:[0-9a-f]{64}$/.test(key))).toBe(true);
  });
});
