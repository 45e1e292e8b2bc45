import { describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { FREE_FAILURES_PER_ACCOUNT, FREE_FAILURES_PER_ADDRESS } from "~/lib/sign-in-throttle.server";
import { loader as adminLoader, action as adminAction } from "~/routes/admin.users";
import { loader as meLoader } from "~/routes/api.me";
import { loader as homeLoader } from "~/routes/home";
import { action as signInAction } from "~/routes/sign-in";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";

async function attempt(email: string, password: string, address = "10.1.1.1") {
  const request = formRequest("/sign-in", { email, password }, { "x-foamtally-client-address": address });
  return settle(() => signInAction(routeArgs(request)));
}

function replyOf(value: unknown) {
  const result = (
    value as { data: { result: { error?: Record<string, string[]>; initialValue?: Record<string, unknown> } } }
  ).data.result;
  return result;
}

// Each attempt checks a password at the production bcrypt cost; on a loaded machine a run of them
// takes longer than the default limit.
describe("sign-in", { timeout: 120_000 }, () => {
  it("signs in with the right password and answers /api/me with the person's roles", async () => {
    const user = await makeUser(["officer", "chief"], "Two Hats");
    const cookie = await signIn(user.email, TEST_PASSWORD);
    const response = (await meLoader(routeArgs(getRequest("/api/me", { Cookie: cookie })))) as Response;
    expect(await response.json()).toEqual({
      id: user.id,
      name: "Two Hats",
      email: user.email,
      roles: ["officer", "chief"],
    });
  });

  it("gives one generic message for a wrong password and an unknown email, keeping the email", async () => {
    const user = await makeUser(["officer"]);
    for (const email of [user.email, "nobody@test.example"]) {
      const outcome = await attempt(email, "wrong password");
      const reply = replyOf(outcome.value);
      expect(reply.error?.[""]).toEqual(["The email or password is incorrect."]);
      expect(reply.initialValue?.email).toBe(email);
      expect(reply.initialValue?.password).toBeUndefined();
    }
  });

  it("reports missing fields at the field", async () => {
    const request = formRequest("/sign-in", { email: "", password: "" });
    const reply = replyOf((await settle(() => signInAction(routeArgs(request)))).value);
    expect(reply.error?.email?.[0]).toMatch(/email/i);
    expect(reply.error?.password?.[0]).toMatch(/password/i);
  });

  it("refuses an oversized field with a message", async () => {
    const reply = replyOf((await attempt(`${"a".repeat(300)}@test.example`, "x")).value);
    expect(reply.error?.email?.[0]).toMatch(/at most 254/);
  });

  it("throttles an account after repeated failures, even with the right password, and audits each", async () => {
    const user = await makeUser(["officer"]);
    for (let i = 0; i < FREE_FAILURES_PER_ACCOUNT; i++) await attempt(user.email, "nope", `10.2.0.${i}`);
    const blocked = await attempt(user.email, TEST_PASSWORD, "10.2.1.1");
    expect((blocked.value as { init: { status: number } }).init.status).toBe(429);
    expect(replyOf(blocked.value).error?.[""]?.[0]).toMatch(/Too many failed sign-ins/);
    const failures = await db("audit_events")
      .where({ action: "sign_in_failed", entity_id: String(user.id) })
      .count({ n: "*" });
    expect(Number(failures[0].n)).toBe(FREE_FAILURES_PER_ACCOUNT);
  });

  it("throttles a client address that guesses across many accounts", async () => {
    const address = "10.3.3.3";
    for (let i = 0; i < FREE_FAILURES_PER_ADDRESS; i++) await attempt(`guess${i}@test.example`, "nope", address);
    const user = await makeUser(["officer"]);
    const blocked = await attempt(user.email, TEST_PASSWORD, address);
    expect((blocked.value as { init: { status: number } }).init.status).toBe(429);
    // The same person from another address is not blocked.
    expect(((await attempt(user.email, TEST_PASSWORD, "10.3.3.4")).value as Response).status).toBe(302);
  });
});

describe("guards", () => {
  it("redirects a page request without a session to sign-in, keeping the address", async () => {
    const outcome = await settle(() => homeLoader(routeArgs(getRequest("/?tab=1"))));
    expect((outcome.value as Response).status).toBe(302);
    expect((outcome.value as Response).headers.get("Location")).toBe("/sign-in?redirectTo=%2F%3Ftab%3D1");
  });

  it("answers the API with 401 JSON, and treats a tampered cookie as no session", async () => {
    const user = await makeUser(["officer"]);
    const cookie = await signIn(user.email, TEST_PASSWORD);
    // The signature's last base64 character may carry only padding bits, so changing it can leave the
    // signature's bytes as they were: change the first character of the signed value instead.
    const tampered = cookie.replace(/=(.)/, (_, first: string) => `=${first === "e" ? "f" : "e"}`);
    expect(tampered).not.toBe(cookie);
    const outcome = await settle(() => meLoader(routeArgs(getRequest("/api/me", { Cookie: tampered }))));
    expect((outcome.value as Response).status).toBe(401);
    expect(await (outcome.value as Response).json()).toHaveProperty("error");
  });

  it("gives an officer 403 on the administrator page", async () => {
    const user = await makeUser(["officer"]);
    const cookie = await signIn(user.email, TEST_PASSWORD);
    const outcome = await settle(() => adminLoader(routeArgs(getRequest("/admin/users", { Cookie: cookie }))));
    expect((outcome.value as { init: { status: number } }).init.status).toBe(403);
  });
});

describe("administering people", () => {
  it("creates an account with roles, audited, and deactivation ends the person's session at once", async () => {
    const admin = await makeUser(["admin"]);
    const adminCookie = await signIn(admin.email, TEST_PASSWORD);
    const email = `new-${Date.now()}@test.example`;
    const created = await settle(() =>
      adminAction(
        routeArgs(
          formRequest(
            "/admin/users",
            {
              intent: "create",
              name: "New Officer",
              email,
              password: "a long temporary pass",
              roles: ["officer", "records"],
            },
            { Cookie: adminCookie },
          ),
        ),
      ),
    );
    expect((created.value as Response).status).toBe(302);
    const row = await db("users").where({ email }).first();
    expect(await db("user_roles").where({ user_id: row.id }).orderBy("role").pluck("role")).toEqual([
      "officer",
      "records",
    ]);
    const audit = await db("audit_events")
      .where({ action: "user_created", entity_id: String(row.id) })
      .first();
    expect(audit.actor_user_id).toBe(admin.id);

    const theirCookie = await signIn(email, "a long temporary pass");
    await adminAction(
      routeArgs(
        formRequest(
          "/admin/users",
          { intent: "update", userId: String(row.id), name: "New Officer", roles: ["officer"] },
          { Cookie: adminCookie },
        ),
      ),
    ).catch((thrown) => thrown);
    const after = await settle(() => meLoader(routeArgs(getRequest("/api/me", { Cookie: theirCookie }))));
    expect((after.value as Response).status).toBe(401);
    const deactivated = await db("audit_events")
      .where({ action: "user_deactivated", entity_id: String(row.id) })
      .first();
    expect(JSON.parse(deactivated.before_json).active).toBe(true);
    expect(JSON.parse(deactivated.after_json).active).toBe(false);
    // And they cannot sign in again.
    const again = await attempt(email, "a long temporary pass", "10.9.9.9");
    expect(replyOf(again.value).error?.[""]).toEqual(["The email or password is incorrect."]);
  });

  it("refuses a duplicate email at the field, writing nothing", async () => {
    const admin = await makeUser(["admin"]);
    const cookie = await signIn(admin.email, TEST_PASSWORD);
    const before = await db("users").count({ n: "*" });
    const outcome = await settle(() =>
      adminAction(
        routeArgs(
          formRequest(
            "/admin/users",
            { intent: "create", name: "Dup", email: admin.email, password: "another long pass", roles: ["officer"] },
            { Cookie: cookie },
          ),
        ),
      ),
    );
    expect(replyOf(outcome.value).error?.email?.[0]).toMatch(/already has an account/);
    expect(await db("users").count({ n: "*" })).toEqual(before);
  });
});

describe("new passwords", () => {
  it("are refused at the field when common, repeated or longer than 72 bytes, on both forms", async () => {
    const admin = await makeUser(["admin"]);
    const cookie = await signIn(admin.email, TEST_PASSWORD);
    const create = (password: string) =>
      settle(() =>
        adminAction(
          routeArgs(
            formRequest(
              "/admin/users",
              {
                intent: "create",
                name: "Weak",
                email: `weak-${Date.now()}@test.example`,
                password,
                roles: ["officer"],
              },
              { Cookie: cookie },
            ),
          ),
        ),
      );
    expect(replyOf((await create("password1234")).value).error?.password?.[0]).toMatch(/common/);
    expect(replyOf((await create("x".repeat(14))).value).error?.password?.[0]).toMatch(/repeated/);
    expect(replyOf((await create("hose ladder pump ".repeat(5))).value).error?.password?.[0]).toMatch(/72 bytes/);
    expect(await db("users").where("name", "Weak").count({ n: "*" })).toEqual([{ n: 0 }]);

    const { action: profileAction } = await import("~/routes/profile");
    const change = await settle(() =>
      profileAction(
        routeArgs(
          formRequest(
            "/profile",
            { currentPassword: TEST_PASSWORD, newPassword: "qwertyuiop12", confirmPassword: "qwertyuiop12" },
            { Cookie: cookie },
          ),
        ),
      ),
    );
    expect(replyOf(change.value).error?.newPassword?.[0]).toMatch(/common or follows an easy pattern/);
    expect(replyOf(change.value).initialValue?.newPassword).toBeUndefined();
  });
});

describe("where sign-in sends you", () => {
  const hostile = ["%2F%09%2Fevil.example", "%2F%2Fevil.example", "%2F%0Aevil", "%2F%0D%2Fevil", "%2F%E3%80%80%2Fevil"];

  it("goes home, never elsewhere and never a 500, for a signed-in visitor", async () => {
    const { loader: signInLoader } = await import("~/routes/sign-in");
    const user = await makeUser(["officer"]);
    const cookie = await signIn(user.email, TEST_PASSWORD);
    for (const encoded of hostile) {
      const outcome = await settle(() =>
        signInLoader(routeArgs(getRequest(`/sign-in?redirectTo=${encoded}`, { Cookie: cookie }))),
      );
      expect((outcome.value as Response).status, encoded).toBe(302);
      expect((outcome.value as Response).headers.get("Location"), encoded).toBe("/");
    }
    const kept = await settle(() =>
      signInLoader(routeArgs(getRequest(`/sign-in?redirectTo=${encodeURIComponent("/map?x=1")}`, { Cookie: cookie }))),
    );
    expect((kept.value as Response).headers.get("Location")).toBe("/map?x=1");
  });

  it("goes home after signing in with a hostile redirectTo in the form", async () => {
    const user = await makeUser(["officer"]);
    for (const encoded of hostile) {
      const request = formRequest(
        "/sign-in",
        { email: user.email, password: TEST_PASSWORD, redirectTo: decodeURIComponent(encoded) },
        { "x-foamtally-client-address": "10.7.7.7" },
      );
      const outcome = await settle(() => signInAction(routeArgs(request)));
      expect((outcome.value as Response).headers.get("Location"), encoded).toBe("/");
    }
  });
});
