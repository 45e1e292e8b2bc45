import { createHash } from "node:crypto";
import type { Knex } from "knex";
import { getObject, putObject } from "../app/lib/storage.server";

/**
 * Frozen quarterly submissions move from a LONGBLOB column to the object store, so that every stored
 * file lives in one place. Each file is written, read back and compared by SHA-256 with the digest
 * recorded when the quarter was submitted before its row names the key and drops the blob; a file
 * whose bytes do not match its recorded digest stops the migration and stays where it is.
 */

const sha256 = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

/** The key of a submitted file: made from its row, never from a name a person typed. */
export function submissionKey(id: number, digest: string): string {
  return `quarterly-submissions/${id}-${digest.slice(0, 16)}`;
}

export async function up(knex: Knex): Promise<void> {
  // Schema changes commit at once in MariaDB: a run stopped by a mismatching file can be run again.
  if (!(await knex.schema.hasColumn("quarterly_submissions", "storage_key"))) {
    await knex.schema.alterTable("quarterly_submissions", (t) => {
      t.string("storage_key", 255).nullable().unique();
    });
  }
  await knex.raw("ALTER TABLE quarterly_submissions MODIFY content LONGBLOB NULL");
  const ids = await knex("quarterly_submissions").whereNull("storage_key").orderBy("id").pluck("id");
  for (const id of ids) {
    const row = await knex("quarterly_submissions").where({ id }).first("content", "content_type", "sha256");
    const content = new Uint8Array(row.content as Buffer);
    if (sha256(content) !== row.sha256) {
      throw new Error(`Quarterly submission ${id}: its bytes do not match its recorded SHA-256; it was not moved.`);
    }
    const key = submissionKey(id, row.sha256);
    await putObject(key, content, row.content_type);
    const stored = await getObject(key);
    if (sha256(stored.body) !== row.sha256) {
      throw new Error(`Quarterly submission ${id}: the stored copy does not match its SHA-256; it was not moved.`);
    }
    await knex("quarterly_submissions").where({ id }).update({ storage_key: key, content: null });
  }
}

export async function down(knex: Knex): Promise<void> {
  const ids = await knex("quarterly_submissions").whereNotNull("storage_key").orderBy("id").pluck("id");
  for (const id of ids) {
    const row = await knex("quarterly_submissions").where({ id }).first("storage_key", "sha256");
    const stored = await getObject(row.storage_key);
    if (sha256(stored.body) !== row.sha256) {
      throw new Error(`Quarterly submission ${id}: the stored copy does not match its SHA-256; it was not moved back.`);
    }
    await knex("quarterly_submissions")
      .where({ id })
      .update({ content: Buffer.from(stored.body), storage_key: null });
  }
  await knex.raw("ALTER TABLE quarterly_submissions MODIFY content LONGBLOB NOT NULL");
  await knex.schema.alterTable("quarterly_submissions", (t) => {
    t.dropColumn("storage_key");
  });
}
