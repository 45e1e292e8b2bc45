import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Knex } from "knex";
import { document, storeDemoFile } from "./08_demo_attachments";

// Demo data only: a one-page PDF marked DEMO as the printout of the demo fleet's first accuracy
// test, and one as the hauler's manifest of the demo's disposal of held concentrate. Runs after the
// foam-system and stock seeds, and only while the file store is up.

const PRINTOUT = document("test_printout", "accuracy-test-printout-demo.pdf", "Refractometer printout", [
  "Three known mixes and one discharge sample (invented readings)",
]);
const MANIFEST = document("disposal_manifest", "disposal-manifest-demo.pdf", "Hauler's disposal manifest", [
  "Hauler: Alder Bend Liquid Waste (invented)",
  "Two drums of held concentrate, 110 gal, for incineration",
  "Manifest number: MANIFEST 026-44817 (demo)",
]);

export async function seed(knex: Knex): Promise<void> {
  const already = await knex("attachments").whereIn("subject", ["foam_test", "stock_movement"]).first("id");
  if (already) return;
  const test = await knex("foam_accuracy_tests").orderBy("id").first("id", "tested_by");
  const disposal = await knex("stock_movements").where({ kind: "disposed" }).orderBy("id").first("id", "created_by");
  const keeper = await knex("user_roles").where({ role: "environmental" }).orderBy("user_id").first("user_id");
  const directory = await mkdtemp(path.join(tmpdir(), "foamtally-demo-owner-files-"));
  try {
    const files = [
      test ? { owner: { subject: "foam_test" as const, id: test.id }, file: PRINTOUT, by: test.tested_by } : null,
      disposal && (disposal.created_by ?? keeper?.user_id)
        ? {
            owner: { subject: "stock_movement" as const, id: disposal.id },
            file: MANIFEST,
            by: disposal.created_by ?? keeper.user_id,
          }
        : null,
    ];
    for (const entry of files) {
      if (!entry) continue;
      if (!(await storeDemoFile(knex, directory, entry.owner, entry.file, entry.by))) {
        console.log("The file store is not running; the demo's test printout and disposal manifest were not added.");
        return;
      }
    }
  } finally {
    await rm(directory, { recursive: true, force: true });
  }
}
