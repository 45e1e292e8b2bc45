// Password reset by e-mailed link: through the outbox, stored as a hash, expiring, single use,
// throttled, and answered the same whether or not the address is known; and the administrator's
// "Send reset link".
import { createHash, randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { RESET_REQUESTED_MESSAGE } from "~/lib/password-reset";
import { PASSWORD_RESETS_PER_ADDRESS_PER_HOUR, PASSWORD_RESETS_PER_EMAIL_PER_HOUR } from "~/lib/rate-limit.server";
import { action as usersAction } from "~/routes/admin.users";
import { action as forgotAction } from "~/routes/forgot-password";
import { action as resetAction, loader as resetLoader } from "~/routes/reset-password.$token";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";

const NEW_PASSWORD = "lantern orchard velvet gravel";

function statusOf(value: unknown): number {
  if (value instanceof Response) return value.status;
  return (value as { init?: { status?: number } | null }).init?.status ?? 200;
}

/** A client address of its own for each test, so that the per-address limit is the test's own. */
const address = () => `10.9.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}`;

async function ask(email: string, from = address()) {
  const request = formRequest("/forgot-password", { email }, { "x-foamtally-client-address": from });
  const { value } = await settle(() => forgotAction(routeArgs(request)));
  return { status: statusOf(value), sent: (value as { data?: { sent?: boolean } }).data?.sent };
}

async function mailsTo(email: string) {
  return db("mail_outbox").where({ kind: "password_reset" }).where("to_addresses", email).orderBy("id");
}

function tokenIn(text: string): string {
  const match = /\/reset-password\/([A-Za-z0-9_-]{43})/.exec(text);
  if (!match) throw new Error("no reset link in the mail");
  return match[1];
}

async function open(token: string) {
  const { value } = await settle(() => resetLoader(routeArgs(getRequest(`/reset-password/${token}`), { token })));
  return { status: statusOf(value), email: (value as { data?: { email?: string | null } }).data?.email ?? null };
}

async function setPassword(token: string, password: string, confirm = password) {
  const request = formRequest(`/reset-password/${token}`, { newPassword: password, confirmPassword: confirm });
  const { value } = await settle(() => resetAction(routeArgs(request, { token })));
  return {
    status: statusOf(value),
    errors: (value as { data?: { result?: { error?: Record<string, string[]> } } }).data?.result?.error,
  };
}

describe("asking for a reset link", () => {
  it("queues a link for a known address, stores only its hash, and answers the same for an unknown one", async () => {
    const person = await makeUser(["officer"], "Reset Asker");
    const known = await ask(person.email);
    const unknown = await ask(`nobody-${randomUUID().slice(0, 8)}@test.example`);
    expect(known).toEqual({ status: 200, sent: true });
    expect(unknown).toEqual(known);
    expect(RESET_REQUESTED_MESSAGE).toMatch(/If an active account uses that address/);

    const [mail] = await mailsTo(person.email);
    expect(mail.subject).toBe("Set a new Foamtally password");
    const token = tokenIn(mail.text_body);
    const [stored] = await db("password_resets").where({ user_id: person.id });
    expect(stored.token_hash).toBe(createHash("sha256").update(token).digest("hex"));
    expect(JSON.stringify(stored)).not.toContain(token);
    // One hour from now (RESET_LINK_MINUTES), give or take the test's own time.
    const minutes = (new Date(stored.expires_at).getTime() - Date.now()) / 60_000;
    expect(minutes).toBeGreaterThan(55);
    expect(minutes).toBeLessThanOrEqual(60);
  });

  it("refuses bad input at the field, with no mail", async () => {
    const outcome = await ask("not an address");
    expect(outcome.status).toBe(400);
  });

  it("sends at most three links an hour to one address, and still answers the same", async () => {
    const person = await makeUser(["officer"], "Reset Repeater");
    const answers = [];
    for (let i = 0; i < PASSWORD_RESETS_PER_EMAIL_PER_HOUR + 1; i++) answers.push(await ask(person.email));
    expect(new Set(answers.map((answer) => JSON.stringify(answer)))).toEqual(
      new Set([JSON.stringify({ status: 200, sent: true })]),
    );
    expect(await mailsTo(person.email)).toHaveLength(PASSWORD_RESETS_PER_EMAIL_PER_HOUR);
  });

  it("slows one client address that asks too often with 429 and Retry-After", async () => {
    const from = address();
    for (let i = 0; i < PASSWORD_RESETS_PER_ADDRESS_PER_HOUR; i++) {
      expect((await ask(`many-${i}-${randomUUID().slice(0, 6)}@test.example`, from)).status).toBe(200);
    }
    const request = formRequest(
      "/forgot-password",
      { email: "one-more@test.example" },
      { "x-foamtally-client-address": from },
    );
    const { value } = await settle(() => forgotAction(routeArgs(request)));
    expect(statusOf(value)).toBe(429);
    expect((value as { init?: { headers?: Record<string, string> } }).init?.headers?.["Retry-After"]).toMatch(/^\d+$/);
  });
});

describe("using a reset link", () => {
  let person: Awaited<ReturnType<typeof makeUser>>;
  let token: string;

  beforeAll(async () => {
    person = await makeUser(["officer"], "Reset User");
    await ask(person.email);
    token = tokenIn((await mailsTo(person.email))[0].text_body);
  });

  it("opens the form for its account, holds new passwords to the rules, then works once", async () => {
    expect(await open(token)).toEqual({ status: 200, email: person.email });
    const weak = await setPassword(token, "password1234");
    expect(weak.status).toBe(400);
    expect(weak.errors?.newPassword?.[0]).toMatch(/common or follows an easy pattern/);
    expect((await setPassword(token, NEW_PASSWORD, "something else entirely")).errors?.confirmPassword).toBeDefined();
    expect((await setPassword(token, "x".repeat(73))).errors?.newPassword?.[0]).toMatch(/at most 72 bytes/);

    const earlierSession = await signIn(person.email, TEST_PASSWORD, address());
    expect((await setPassword(token, NEW_PASSWORD)).status).toBe(302);
    await expect(signIn(person.email, TEST_PASSWORD, address())).rejects.toThrow();
    expect(await signIn(person.email, NEW_PASSWORD, address())).toBeTruthy();
    expect(earlierSession).toBeTruthy();
    const sessionsLeft = await db("sessions").where({ user_id: person.id }).count({ n: "*" });
    expect(Number(sessionsLeft[0].n)).toBe(1);

    // Used: neither the page nor the action accepts it again.
    expect(await open(token)).toEqual({ status: 410, email: null });
    expect((await setPassword(token, "another lantern orchard velvet")).status).toBe(410);
    const audit = await db("audit_events").where({ action: "password_reset", entity_id: String(person.id) });
    expect(audit).toHaveLength(1);
  });

  it("stops working when it expires, when a newer link is sent, and for a made-up token", async () => {
    const other = await makeUser(["officer"], "Reset Expiry");
    await ask(other.email);
    const first = tokenIn((await mailsTo(other.email))[0].text_body);
    await ask(other.email);
    const second = tokenIn((await mailsTo(other.email))[1].text_body);
    expect((await open(first)).status).toBe(410);
    expect((await open(second)).status).toBe(200);
    await db("password_resets")
      .where({ user_id: other.id })
      .update({ expires_at: new Date(Date.now() - 1000) });
    expect((await open(second)).status).toBe(410);
    expect((await setPassword(second, NEW_PASSWORD)).status).toBe(410);
    expect((await open("x".repeat(43))).status).toBe(410);
    expect((await open("short")).status).toBe(410);
  });
});

describe("the administrator's Send reset link", () => {
  it("queues a link for the person, audited; the chief may not send one to an administrator", async () => {
    const admin = await makeUser(["admin"], "Reset Administrator");
    const chief = await makeUser(["chief"], "Reset Chief");
    const officer = await makeUser(["officer"], "Reset Target");
    const adminCookie = await signIn(admin.email, TEST_PASSWORD, address());
    const chiefCookie = await signIn(chief.email, TEST_PASSWORD, address());
    const send = async (cookie: string, userId: number) => {
      const request = formRequest("/admin/users", { intent: "send-reset", userId: String(userId) }, { Cookie: cookie });
      return statusOf((await settle(() => usersAction(routeArgs(request)))).value);
    };
    expect(await send(adminCookie, officer.id)).toBe(302);
    const [mail] = await mailsTo(officer.email);
    expect(mail.text_body).toContain("An administrator asked Foamtally");
    expect((await open(tokenIn(mail.text_body))).status).toBe(200);
    const audit = await db("audit_events")
      .where({ action: "password_reset_sent", entity_id: String(officer.id) })
      .first();
    expect(audit).toMatchObject({ actor_user_id: admin.id });

    expect(await send(chiefCookie, admin.id)).toBe(403);
    expect(await mailsTo(admin.email)).toHaveLength(0);
    expect(await send(adminCookie, 99_999_999)).toBe(404);
  });
});
