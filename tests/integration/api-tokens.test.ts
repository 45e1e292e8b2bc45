import { describe, expect, it } from "vitest";
import { hashToken } from "~/lib/auth.server";
import { db } from "~/lib/db.server";
import { action as adminAction } from "~/routes/admin.users";
import { loader as meLoader } from "~/routes/api.me";
import { action as profileAction, loader as profileLoader } from "~/routes/profile";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";

async function createToken(cookie: string, name: string) {
  const outcome = await settle(() =>
    profileAction(routeArgs(formRequest("/profile", { intent: "create-token", name }, { Cookie: cookie }))),
  );
  return outcome.value as {
    data: { newToken: { id: number; token: string } | null; result: { error?: Record<string, string[]> } };
  };
}

async function meWith(token: string) {
  const outcome = await settle(() => meLoader(routeArgs(getRequest("/api/me", { Authorization: `Bearer ${token}` }))));
  return outcome.value as Response;
}

describe("personal API tokens", () => {
  it("creates a token shown once, stored only as its SHA-256 hash, that answers /api/me and records its use", async () => {
    const user = await makeUser(["environmental", "chief"], "Token Person");
    const cookie = await signIn(user.email, TEST_PASSWORD);
    const created = await createToken(cookie, "station dashboard");
    const { id, token } = created.data.newToken!;
    const row = await db("api_tokens").where({ id }).first();
    expect(row.token_hash).toBe(hashToken(token));
    expect(row.token_hash).not.toContain(token);
    expect(JSON.stringify(row)).not.toContain(token);
    expect(row.last_used_at).toBeNull();

    const response = await meWith(token);
    expect(response.status).toBe(200);
    expect(await response.json()).toEqual({
      id: user.id,
      name: "Token Person",
      email: user.email,
      roles: ["environmental", "chief"],
    });
    expect((await db("api_tokens").where({ id }).first()).last_used_at).not.toBeNull();

    const page = (await profileLoader(routeArgs(getRequest("/profile", { Cookie: cookie })))) as {
      tokens: Array<{ id: number; name: string; prefix: string; lastUsedAt: string | null }>;
    };
    const listed = page.tokens.find((item) => item.id === id)!;
    expect(listed).toMatchObject({ name: "station dashboard", prefix: token.slice(0, 10) });
    expect(listed.lastUsedAt).not.toBeNull();
    expect(JSON.stringify(page)).not.toContain(token);
    const audit = await db("audit_events")
      .where({ action: "api_token_created", entity_id: String(id) })
      .first();
    expect(audit.actor_user_id).toBe(user.id);
    expect(audit.summary).not.toContain(token);
  });

  it("requires a name, at the field", async () => {
    const user = await makeUser(["officer"]);
    const cookie = await signIn(user.email, TEST_PASSWORD);
    const before = Number((await db("api_tokens").where({ user_id: user.id }).count({ n: "*" }))[0].n);
    const created = await createToken(cookie, "  ");
    expect(created.data.newToken).toBeNull();
    expect(created.data.result.error?.name?.[0]).toMatch(/Name the token/);
    expect(Number((await db("api_tokens").where({ user_id: user.id }).count({ n: "*" }))[0].n)).toBe(before);
  });

  it("a revoked token gets 401 at once, and nobody can revoke another person's token", async () => {
    const user = await makeUser(["officer"]);
    const cookie = await signIn(user.email, TEST_PASSWORD);
    const { id, token } = (await createToken(cookie, "script")).data.newToken!;
    expect((await meWith(token)).status).toBe(200);

    const stranger = await makeUser(["officer"]);
    const strangerCookie = await signIn(stranger.email, TEST_PASSWORD);
    const refused = await settle(() =>
      profileAction(
        routeArgs(formRequest("/profile", { intent: "revoke-token", tokenId: String(id) }, { Cookie: strangerCookie })),
      ),
    );
    expect((refused.value as { init: { status: number } }).init.status).toBe(404);
    expect((await meWith(token)).status).toBe(200);

    const revoked = await settle(() =>
      profileAction(
        routeArgs(formRequest("/profile", { intent: "revoke-token", tokenId: String(id) }, { Cookie: cookie })),
      ),
    );
    expect((revoked.value as Response).status).toBe(302);
    const after = await meWith(token);
    expect(after.status).toBe(401);
    expect(await after.json()).toHaveProperty("error");
    const audit = await db("audit_events")
      .where({ action: "api_token_revoked", entity_id: String(id) })
      .first();
    expect(audit.actor_user_id).toBe(user.id);
  });

  it("a deactivated person's token gets 401 at once", async () => {
    const admin = await makeUser(["admin"]);
    const adminCookie = await signIn(admin.email, TEST_PASSWORD);
    const user = await makeUser(["records"]);
    const cookie = await signIn(user.email, TEST_PASSWORD);
    const { token } = (await createToken(cookie, "records export")).data.newToken!;
    expect((await meWith(token)).status).toBe(200);
    await settle(() =>
      adminAction(
        routeArgs(
          formRequest(
            "/admin/users",
            { intent: "update", userId: String(user.id), name: user.name, roles: ["records"] },
            { Cookie: adminCookie },
          ),
        ),
      ),
    );
    expect(Boolean((await db("users").where({ id: user.id }).first()).active)).toBe(false);
    expect((await meWith(token)).status).toBe(401);
  });

  it("an unknown or malformed token gets 401", async () => {
    expect((await meWith("ft_not-a-real-token")).status).toBe(401);
    const outcome = await settle(() => meLoader(routeArgs(getRequest("/api/me", { Authorization: "Bearer" }))));
    expect((outcome.value as Response).status).toBe(401);
  });
});
