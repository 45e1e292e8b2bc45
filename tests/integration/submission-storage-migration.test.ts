// The move of frozen quarterly submissions from LONGBLOB rows to the object store keeps every
// file's SHA-256 equal to the digest recorded when the quarter was submitted, both ways.
import { createHash, randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { env } from "~/lib/env.server";
import { getObject } from "~/lib/storage.server";
import { startFileStore } from "../support/file-store";
import { privateDatabase } from "../support/test-database";

const MOVE = "20261203130002_submissions_in_object_store.ts";
const database = privateDatabase("submission_move");
const knex = database.knex;
let closeFileStore: () => Promise<void>;

const sha256 = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

/** Runs migrations one at a time until the move is the next one pending. */
async function migrateToJustBeforeMove() {
  for (;;) {
    const [, pending] = (await knex.migrate.list()) as [unknown, { file: string }[]];
    if (pending.length === 0) throw new Error(`${MOVE} is not pending`);
    if (pending[0].file === MOVE) return;
    await knex.migrate.up();
  }
}

async function submission(submittedBy: number, label: string, content: Buffer, digest = sha256(content)) {
  const [id] = await knex("quarterly_submissions").insert({
    period_from: "2025-01-01",
    period_to: "2025-03-31",
    label,
    file_name: `${label}.xlsx`,
    content_type: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
    content,
    sha256: digest,
    byte_size: content.length,
    submitted_by: submittedBy,
  });
  return id as number;
}

const endpointBefore = process.env.S3_ENDPOINT;

beforeAll(async () => {
  closeFileStore = await startFileStore("submission-move");
  // Knex loads the migration itself, with a storage module of its own that reads process.env.
  process.env.S3_ENDPOINT = env().S3_ENDPOINT;
  await database.create();
  await migrateToJustBeforeMove();
});

afterAll(async () => {
  await database.drop();
  await closeFileStore();
  if (endpointBefore === undefined) delete process.env.S3_ENDPOINT;
  else process.env.S3_ENDPOINT = endpointBefore;
});

describe("moving submitted quarters to the object store", () => {
  it("keeps each file byte for byte under its recorded digest, and moves it back on rollback", async () => {
    const [userId] = await knex("users").insert({ email: "mover@test.example", name: "Mover", password_hash: "x" });
    const files = [randomBytes(300_000), Buffer.from("PK\u0003\u0004 a small workbook")];
    const ids = [await submission(userId, "2025 Q1", files[0]), await submission(userId, "2025 Q2", files[1])];

    await knex.migrate.up({ name: MOVE });
    for (const [index, id] of ids.entries()) {
      const row = await knex("quarterly_submissions").where({ id }).first();
      expect(row.content).toBeNull();
      expect(row.storage_key).toBe(`quarterly-submissions/${id}-${row.sha256.slice(0, 16)}`);
      const stored = (await getObject(row.storage_key)).body;
      expect(sha256(stored)).toBe(row.sha256);
      expect(Buffer.from(stored).equals(files[index])).toBe(true);
    }

    await knex.migrate.down({ name: MOVE });
    for (const [index, id] of ids.entries()) {
      const row = await knex("quarterly_submissions").where({ id }).first();
      expect(row.storage_key).toBeUndefined();
      expect(sha256(row.content)).toBe(row.sha256);
      expect(Buffer.from(row.content).equals(files[index])).toBe(true);
    }
  });

  it("stops, moving nothing of that row, when a file does not match its recorded digest", async () => {
    const [userId] = await knex("users").insert({ email: "tamper@test.example", name: "Tamper", password_hash: "x" });
    const id = await submission(userId, "2025 Q3", Buffer.from("changed after submission"), "0".repeat(64));
    await expect(knex.migrate.up({ name: MOVE })).rejects.toThrow(/do not match its recorded SHA-256/);
    const row = await knex("quarterly_submissions").where({ id }).first();
    expect(row.content).not.toBeNull();
    expect(row.storage_key ?? null).toBeNull();
  });
});
