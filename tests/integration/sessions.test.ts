import { describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { deleteExpiredSessions, flashHeaders, sessionIdHash } from "~/lib/session.server";
import { loader as rootLoader } from "~/root";
import { action as adminAction, loader as adminLoader } from "~/routes/admin.users";
import { loader as meLoader } from "~/routes/api.me";
import { action as profileAction } from "~/routes/profile";
import { action as signOutAction } from "~/routes/sign-out";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";

async function meStatus(cookie: string): Promise<number> {
  const outcome = await settle(() => meLoader(routeArgs(getRequest("/api/me", { Cookie: cookie }))));
  return (outcome.value as Response).status;
}

/** The id inside the signed cookie value `id.signature`, as React Router serialises it. */
function idOf(cookie: string): string {
  const value = decodeURIComponent(cookie.split("=").slice(1).join("="));
  const unsigned = value.slice(0, value.lastIndexOf("."));
  return JSON.parse(Buffer.from(unsigned, "base64").toString("utf8"));
}

async function signOut(cookie: string) {
  return settle(() => signOutAction(routeArgs(formRequest("/sign-out", {}, { Cookie: cookie }))));
}

describe("sessions kept in the database", () => {
  it("give the browser only a random id, and store only its hash", async () => {
    const user = await makeUser(["officer"]);
    const cookie = await signIn(user.email, TEST_PASSWORD);
    const id = idOf(cookie);
    expect(id).toMatch(/^[A-Za-z0-9_-]{43}$/);
    // The signed value is the bare id: no user id, role or other data travels in the cookie.
    expect(decodeURIComponent(cookie)).not.toMatch(/userId|officer/);
    const row = await db("sessions")
      .where({ id_hash: sessionIdHash(id) })
      .first();
    expect(row.user_id).toBe(user.id);
    expect(await db("sessions").where({ id_hash: id }).first()).toBeUndefined();
  });

  it("start a new id at sign-in, so an id held before signing in is never signed in", async () => {
    const user = await makeUser(["officer"]);
    const anonymous = (await flashHeaders(getRequest("/"), "hello")) as Record<string, string>;
    const planted = anonymous["Set-Cookie"].split(";")[0];
    const { action: signInAction } = await import("~/routes/sign-in");
    const outcome = await settle(() =>
      signInAction(
        routeArgs(
          formRequest(
            "/sign-in",
            { email: user.email, password: TEST_PASSWORD },
            { Cookie: planted, "x-foamtally-client-address": "10.0.0.1" },
          ),
        ),
      ),
    );
    const signedIn = (outcome.value as Response).headers.get("Set-Cookie")!.split(";")[0];
    expect(idOf(signedIn)).not.toBe(idOf(planted));
    expect(await meStatus(planted)).toBe(401);
    expect(await meStatus(signedIn)).toBe(200);
  });

  it("end at sign-out: a copied cookie is dead on the server", async () => {
    const user = await makeUser(["officer"]);
    const cookie = await signIn(user.email, TEST_PASSWORD);
    const copy = `${cookie}`;
    expect(await meStatus(copy)).toBe(200);
    const out = await signOut(cookie);
    expect((out.value as Response).status).toBe(302);
    expect(await meStatus(copy)).toBe(401);
    expect(await db("sessions").where({ user_id: user.id }).count({ n: "*" })).toEqual([{ n: 0 }]);
  });

  it("end every other session at a password change, keeping the browser that made it", async () => {
    const user = await makeUser(["officer"]);
    const here = await signIn(user.email, TEST_PASSWORD);
    const elsewhere = await signIn(user.email, TEST_PASSWORD, "10.0.0.2");
    const newPassword = "tidal basin proportioner 42";
    const outcome = await settle(() =>
      profileAction(
        routeArgs(
          formRequest(
            "/profile",
            { currentPassword: TEST_PASSWORD, newPassword, confirmPassword: newPassword },
            { Cookie: here },
          ),
        ),
      ),
    );
    expect((outcome.value as Response).status).toBe(302);
    expect(await meStatus(here)).toBe(200);
    expect(await meStatus(elsewhere)).toBe(401);
    const audit = await db("audit_events")
      .where({ action: "password_changed", entity_id: String(user.id) })
      .first();
    expect(audit.summary).toBe("1 other session ended");
  });

  it("end at deactivation", async () => {
    const admin = await makeUser(["admin"]);
    const adminCookie = await signIn(admin.email, TEST_PASSWORD);
    const person = await makeUser(["officer"], "Leaving Officer");
    const theirs = await signIn(person.email, TEST_PASSWORD);
    await settle(() =>
      adminAction(
        routeArgs(
          formRequest(
            "/admin/users",
            { intent: "update", userId: String(person.id), name: person.name, roles: ["officer"] },
            { Cookie: adminCookie },
          ),
        ),
      ),
    );
    expect(await meStatus(theirs)).toBe(401);
    expect(await db("sessions").where({ user_id: person.id }).count({ n: "*" })).toEqual([{ n: 0 }]);
  });

  it("end on every browser when an administrator ends a person's sessions, audited", async () => {
    const admin = await makeUser(["admin"]);
    const adminCookie = await signIn(admin.email, TEST_PASSWORD);
    const person = await makeUser(["officer"], "Lost Phone");
    const phone = await signIn(person.email, TEST_PASSWORD);
    const desk = await signIn(person.email, TEST_PASSWORD, "10.0.0.3");

    const page = (await adminLoader(routeArgs(getRequest("/admin/users", { Cookie: adminCookie })))) as {
      users: { id: number; sessions: number }[];
    };
    expect(page.users.find((row) => row.id === person.id)?.sessions).toBe(2);

    const outcome = await settle(() =>
      adminAction(
        routeArgs(
          formRequest("/admin/users", { intent: "end-sessions", userId: String(person.id) }, { Cookie: adminCookie }),
        ),
      ),
    );
    expect((outcome.value as Response).status).toBe(302);
    expect(await meStatus(phone)).toBe(401);
    expect(await meStatus(desk)).toBe(401);
    expect(await meStatus(adminCookie)).toBe(200);
    const audit = await db("audit_events")
      .where({ action: "sessions_ended", entity_id: String(person.id) })
      .first();
    expect(audit.actor_user_id).toBe(admin.id);
    expect(audit.summary).toMatch(/^2 sessions of /);
  });

  it("let only someone who manages the account end its sessions", async () => {
    const admin = await makeUser(["admin"]);
    const adminCookie = await signIn(admin.email, TEST_PASSWORD);
    const chief = await makeUser(["chief"]);
    const chiefCookie = await signIn(chief.email, TEST_PASSWORD);
    const officer = await makeUser(["officer"]);
    const officerCookie = await signIn(officer.email, TEST_PASSWORD);

    const byOfficer = await settle(() =>
      adminAction(
        routeArgs(
          formRequest("/admin/users", { intent: "end-sessions", userId: String(admin.id) }, { Cookie: officerCookie }),
        ),
      ),
    );
    expect((byOfficer.value as { init: { status: number } }).init.status).toBe(403);
    // The chief manages people but not administrators' accounts.
    const byChief = await settle(() =>
      adminAction(
        routeArgs(
          formRequest("/admin/users", { intent: "end-sessions", userId: String(admin.id) }, { Cookie: chiefCookie }),
        ),
      ),
    );
    expect([403, 404]).toContain((byChief.value as { init: { status: number } }).init.status);
    expect(await meStatus(adminCookie)).toBe(200);
    const missing = await settle(() =>
      adminAction(
        routeArgs(formRequest("/admin/users", { intent: "end-sessions", userId: "99999999" }, { Cookie: adminCookie })),
      ),
    );
    expect((missing.value as { init: { status: number } }).init.status).toBe(404);
  });

  it("keep flash messages for a signed-in person and for an anonymous visitor", async () => {
    const user = await makeUser(["officer"]);
    const cookie = await signIn(user.email, TEST_PASSWORD);
    const headers = (await flashHeaders(getRequest("/", { Cookie: cookie }), "Saved it.")) as Record<string, string>;
    const next = headers["Set-Cookie"].split(";")[0];
    const shown = (await rootLoader(routeArgs(getRequest("/", { Cookie: next })))) as { data: { flash: string } };
    expect(shown.data.flash).toBe("Saved it.");
    const again = (await rootLoader(routeArgs(getRequest("/", { Cookie: next })))) as {
      data: { flash: string | null };
    };
    expect(again.data.flash).toBeNull();
    expect(await meStatus(next)).toBe(200);

    const anonymous = (await flashHeaders(getRequest("/sign-in"), "Signed out.")) as Record<string, string>;
    const anonymousCookie = anonymous["Set-Cookie"].split(";")[0];
    const anonymousShown = (await rootLoader(routeArgs(getRequest("/sign-in", { Cookie: anonymousCookie })))) as {
      data: { flash: string; user: unknown };
    };
    expect(anonymousShown.data).toMatchObject({ flash: "Signed out.", user: null });
  });

  it("are not read once expired, and expired rows are swept", async () => {
    const user = await makeUser(["officer"]);
    const cookie = await signIn(user.email, TEST_PASSWORD);
    const hash = sessionIdHash(idOf(cookie));
    await db("sessions")
      .where({ id_hash: hash })
      .update({ expires_at: new Date(Date.now() - 60_000) });
    expect(await meStatus(cookie)).toBe(401);
    expect(await deleteExpiredSessions()).toBeGreaterThanOrEqual(1);
    expect(await db("sessions").where({ id_hash: hash }).first()).toBeUndefined();
  });
});
