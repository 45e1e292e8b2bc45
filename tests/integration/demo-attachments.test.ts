import exifr from "exifr";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { env } from "~/lib/env.server";
import { getObject } from "~/lib/storage.server";
import { startFileStore } from "../support/file-store";
import { privateDatabase } from "../support/test-database";

// The demo's sample attachments, seeded into a database of their own with the object-store fake up.
const demo = privateDatabase("demo_files");
const knex = demo.knex;
const SEEDS = [
  "01_agency_and_accounts.ts",
  "02_catalogue.ts",
  "02_foam_systems.ts",
  "03_events.ts",
  "08_demo_attachments.ts",
  "08_stock.ts",
  "09_demo_test_and_disposal_files.ts",
];
const endpointBefore = process.env.S3_ENDPOINT;
let closeFileStore: () => Promise<void>;

beforeAll(async () => {
  closeFileStore = await startFileStore("demo-attachments");
  // Knex loads the seed itself, with a storage module of its own that reads process.env.
  process.env.S3_ENDPOINT = env().S3_ENDPOINT;
  await demo.seed(SEEDS);
}, 120_000);

afterAll(async () => {
  await demo.drop();
  await closeFileStore();
  if (endpointBefore === undefined) delete process.env.S3_ENDPOINT;
  else process.env.S3_ENDPOINT = endpointBefore;
});

describe("the demo's attachments", () => {
  it("are invented, plainly demo files of every kind, stored without location data and with thumbnails", async () => {
    const rows = await knex("attachments").orderBy("id");
    expect(new Set(rows.map((row) => row.kind))).toEqual(
      new Set(["photo", "disposal_manifest", "lab_result", "test_printout"]),
    );
    for (const row of rows) {
      expect(row.file_name).toMatch(/-demo\.(jpg|pdf)$/);
      const body = Buffer.from((await getObject(row.storage_key)).body);
      expect(body.length).toBe(Number(row.byte_size));
      if (row.kind === "photo") {
        expect(await exifr.gps(body)).toBeUndefined();
        expect(row.thumbnail_key).toMatch(/-thumbnail\.webp$/);
        expect((await getObject(row.thumbnail_key)).body.byteLength).toBeGreaterThan(0);
      } else {
        expect(body.toString("latin1")).toContain("DEMO DATA");
      }
    }
  });

  it("include a printout on an accuracy test and the hauler's manifest on the disposal", async () => {
    const printout = await knex("attachments").where({ subject: "foam_test" }).first();
    expect(printout).toMatchObject({ kind: "test_printout", file_name: "accuracy-test-printout-demo.pdf" });
    expect(await knex("foam_accuracy_tests").where({ id: printout.subject_id }).first("id")).toBeTruthy();
    const manifest = await knex("attachments").where({ subject: "stock_movement" }).first();
    expect(manifest).toMatchObject({ kind: "disposal_manifest", file_name: "disposal-manifest-demo.pdf" });
    expect(await knex("stock_movements").where({ id: manifest.subject_id }).first("kind")).toEqual({
      kind: "disposed",
    });
    expect(Buffer.from((await getObject(manifest.storage_key)).body).toString("latin1")).toContain("DEMO DATA");
  });
});
