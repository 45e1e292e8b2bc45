// Who may change whose account and roles, and what an API token may not do.
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { action as adminAction, loader as adminLoader } from "~/routes/admin.users";
import { loader as meLoader } from "~/routes/api.me";
import { loader as csvLoader } from "~/routes/events.csv";
import { action as profileAction } from "~/routes/profile";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { makeStation } from "../support/usage-fixtures";

let chiefCookie: string;
let adminCookie: string;

beforeAll(async () => {
  chiefCookie = await signIn((await makeUser(["chief"])).email, TEST_PASSWORD);
  adminCookie = await signIn((await makeUser(["admin"])).email, TEST_PASSWORD);
});

function statusOf(value: unknown): number {
  if (value instanceof Response) return value.status;
  return (value as { init?: { status?: number } | null }).init?.status ?? 200;
}

async function postPeople(cookie: string, fields: Record<string, string | string[]>, headers: HeadersInit = {}) {
  const request = formRequest("/admin/users", fields, { Cookie: cookie, ...headers });
  return (await settle(() => adminAction(routeArgs(request)))).value;
}

const rolesOf = async (userId: number) => (await db("user_roles").where({ user_id: userId }).pluck("role")).sort();

describe("the administrator role", () => {
  it("the chief cannot create an administrator; nothing is written", async () => {
    const email = `would-be-admin-${Date.now()}@test.example`;
    const outcome = await postPeople(chiefCookie, {
      intent: "create",
      name: "Would-be Admin",
      email,
      password: TEST_PASSWORD,
      roles: ["admin"],
    });
    expect(statusOf(outcome)).toBe(403);
    expect((outcome as { data: { result: { error: Record<string, string[]> } } }).data.result.error.roles[0]).toMatch(
      /Only an administrator/,
    );
    expect(await db("users").where({ email }).first()).toBeUndefined();
  });

  it("the chief cannot give the administrator role, nor change an administrator's account", async () => {
    const clerk = await makeUser(["records"]);
    const promote = await postPeople(chiefCookie, {
      intent: "update",
      userId: String(clerk.id),
      name: clerk.name,
      roles: ["records", "admin"],
      active: "on",
    });
    expect(statusOf(promote)).toBe(403);
    expect(await rolesOf(clerk.id)).toEqual(["records"]);

    const admin = await makeUser(["admin"]);
    const demote = await postPeople(chiefCookie, {
      intent: "update",
      userId: String(admin.id),
      name: admin.name,
      roles: ["records"],
      active: "on",
    });
    expect(statusOf(demote)).toBe(403);
    const deactivate = await postPeople(chiefCookie, {
      intent: "update",
      userId: String(admin.id),
      name: admin.name,
      roles: ["admin"],
    });
    expect(statusOf(deactivate)).toBe(403);
    expect(await rolesOf(admin.id)).toEqual(["admin"]);
    expect(Boolean((await db("users").where({ id: admin.id }).first()).active)).toBe(true);
  });

  it("the chief still manages everyone else; the page shows administrators read-only and offers no administrator role", async () => {
    const clerk = await makeUser(["records"]);
    const outcome = await postPeople(chiefCookie, {
      intent: "update",
      userId: String(clerk.id),
      name: clerk.name,
      roles: ["records", "officer"],
      active: "on",
    });
    expect(statusOf(outcome)).toBe(302);
    expect(await rolesOf(clerk.id)).toEqual(["officer", "records"]);
    const page = (await adminLoader(routeArgs(getRequest("/admin/users", { Cookie: chiefCookie })))) as {
      users: Array<{ id: number; roles: string[]; editable: boolean }>;
      canGrantAdmin: boolean;
    };
    expect(page.canGrantAdmin).toBe(false);
    expect(page.users.filter((user) => user.roles.includes("admin")).every((user) => !user.editable)).toBe(true);
    expect(page.users.find((user) => user.id === clerk.id)?.editable).toBe(true);
  });

  it("an administrator gives and takes away the administrator role, and sets a person's station", async () => {
    const clerk = await makeUser(["records"]);
    const station = await makeStation();
    const grant = await postPeople(adminCookie, {
      intent: "update",
      userId: String(clerk.id),
      name: clerk.name,
      roles: ["records", "admin"],
      stationId: String(station.id),
      active: "on",
    });
    expect(statusOf(grant)).toBe(302);
    expect(await rolesOf(clerk.id)).toEqual(["admin", "records"]);
    expect((await db("users").where({ id: clerk.id }).first()).station_id).toBe(station.id);
    const unknownStation = await postPeople(adminCookie, {
      intent: "update",
      userId: String(clerk.id),
      name: clerk.name,
      roles: ["records"],
      stationId: "999999",
      active: "on",
    });
    expect(statusOf(unknownStation)).toBe(400);
    expect(await rolesOf(clerk.id)).toEqual(["admin", "records"]);
    const revoke = await postPeople(adminCookie, {
      intent: "update",
      userId: String(clerk.id),
      name: clerk.name,
      roles: ["records"],
      stationId: String(station.id),
      active: "on",
    });
    expect(statusOf(revoke)).toBe(302);
    expect(await rolesOf(clerk.id)).toEqual(["records"]);
  });
});

describe("API tokens count on /api/* only", () => {
  async function tokenOf(cookie: string) {
    const request = formRequest("/profile", { intent: "create-token", name: "script" }, { Cookie: cookie });
    const outcome = await settle(() => profileAction(routeArgs(request)));
    return (outcome.value as { data: { newToken: { id: number; token: string } } }).data.newToken;
  }

  it("an administrator's token answers /api/me but signs into no page or form action", async () => {
    const admin = await makeUser(["admin"]);
    const cookie = await signIn(admin.email, TEST_PASSWORD);
    const { id, token } = await tokenOf(cookie);
    const bearer = { Authorization: `Bearer ${token}` };
    expect(statusOf(await meLoader(routeArgs(getRequest("/api/me", bearer))))).toBe(200);

    // Minting a second token and revoking the first, with the token alone: both go to sign-in.
    const tokensBefore = await db("api_tokens").where({ user_id: admin.id }).count({ n: "*" });
    for (const fields of <Array<Record<string, string>>>[
      { intent: "create-token", name: "minted" },
      { intent: "revoke-token", tokenId: String(id) },
    ]) {
      const outcome = await settle(() => profileAction(routeArgs(formRequest("/profile", fields, bearer))));
      expect(statusOf(outcome.value)).toBe(302);
      expect((outcome.value as Response).headers.get("Location")).toMatch(/^\/sign-in/);
    }
    expect(await db("api_tokens").where({ user_id: admin.id }).count({ n: "*" })).toEqual(tokensBefore);
    expect((await db("api_tokens").where({ id }).first()).revoked_at).toBeNull();

    // Changing someone's roles through the people page, with the token alone.
    const clerk = await makeUser(["records"]);
    const outcome = await settle(() =>
      adminAction(
        routeArgs(
          formRequest(
            "/admin/users",
            { intent: "update", userId: String(clerk.id), name: clerk.name, roles: ["admin"], active: "on" },
            bearer,
          ),
        ),
      ),
    );
    expect(statusOf(outcome.value)).toBe(302);
    expect((outcome.value as Response).headers.get("Location")).toMatch(/^\/sign-in/);
    expect(await rolesOf(clerk.id)).toEqual(["records"]);
  });

  it("a token does not download the events CSV, which is not under /api/", async () => {
    const clerk = await makeUser(["records"]);
    const { token } = await tokenOf(await signIn(clerk.email, TEST_PASSWORD));
    const outcome = await settle(() =>
      csvLoader(routeArgs(getRequest("/events.csv", { Authorization: `Bearer ${token}` }))),
    );
    expect(statusOf(outcome.value)).toBe(302);
  });
});
