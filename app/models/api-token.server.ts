import { randomBytes } from "node:crypto";
import { MAX_ACTIVE_TOKENS } from "~/lib/api-token-form";
import { recordAudit } from "~/lib/audit.server";
import { hashToken, type SessionUser } from "~/lib/auth.server";
import { db } from "~/lib/db.server";

export type ApiTokenRow = {
  id: number;
  name: string;
  prefix: string;
  createdAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
};

const iso = (value: Date | string | null) => (value == null ? null : new Date(value).toISOString());

export async function listApiTokens(userId: number): Promise<ApiTokenRow[]> {
  const rows = await db("api_tokens")
    .where({ user_id: userId })
    .orderByRaw("revoked_at IS NULL DESC")
    .orderBy("created_at", "desc")
    .orderBy("id", "desc");
  return rows.map((row) => ({
    id: row.id,
    name: row.name,
    prefix: row.token_prefix,
    createdAt: iso(row.created_at)!,
    lastUsedAt: iso(row.last_used_at),
    revokedAt: iso(row.revoked_at),
  }));
}

export class TooManyTokensError extends Error {}

/**
 * Creates a personal API token. The secret is returned once and only its SHA-256 hash is stored,
 * with a short prefix so the person can tell their tokens apart.
 */
export async function createApiToken(
  user: SessionUser,
  name: string,
  clientAddress?: string,
): Promise<{ id: number; token: string }> {
  const token = `ft_${randomBytes(32).toString("base64url")}`;
  const prefix = token.slice(0, 10);
  const id = await db.transaction(async (trx) => {
    const active = await trx("api_tokens").where({ user_id: user.id }).whereNull("revoked_at").count({ n: "*" });
    if (Number(active[0].n) >= MAX_ACTIVE_TOKENS) throw new TooManyTokensError();
    const [created] = await trx("api_tokens").insert({
      user_id: user.id,
      name,
      token_prefix: prefix,
      token_hash: hashToken(token),
    });
    await recordAudit(
      {
        actorUserId: user.id,
        actorLabel: user.email,
        action: "api_token_created",
        entityType: "api_token",
        entityId: created,
        summary: `${name} (${prefix}…)`,
        clientAddress,
      },
      trx,
    );
    return created;
  });
  return { id, token };
}

/** Revokes one of the person's own tokens at once; false when it is not theirs or already revoked. */
export async function revokeApiToken(user: SessionUser, tokenId: number, clientAddress?: string): Promise<boolean> {
  return db.transaction(async (trx) => {
    const row = await trx("api_tokens")
      .where({ id: tokenId, user_id: user.id })
      .whereNull("revoked_at")
      .forUpdate()
      .first();
    if (!row) return false;
    await trx("api_tokens").where({ id: tokenId }).update({ revoked_at: trx.fn.now() });
    await recordAudit(
      {
        actorUserId: user.id,
        actorLabel: user.email,
        action: "api_token_revoked",
        entityType: "api_token",
        entityId: tokenId,
        summary: `${row.name} (${row.token_prefix}…)`,
        clientAddress,
      },
      trx,
    );
    return true;
  });
}
