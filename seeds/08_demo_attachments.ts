import { mkdtemp, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import type { Knex } from "knex";
import { prepareFile } from "../app/lib/attachment-content.server";
import type { AttachmentKind } from "../app/lib/foam/vocabulary";
import { putObject, putObjectFile, StorageUnavailableError } from "../app/lib/storage.server";
import { attachmentKeys, type AttachmentOwner } from "../app/models/attachments.server";
import { demoDocumentPdf, demoPhotoJpeg } from "../scripts/demo-files";

// Demo data only: invented pictures (coloured fields with a label, drawn by the script) and one-page
// PDFs marked DEMO, attached to a few of the demo's reports through the same preparation as an
// upload (content check, metadata stripped, thumbnail). Runs only while the file store is up.

export type DemoFile = { kind: AttachmentKind; name: string; bytes: () => Promise<Uint8Array> };

const photo = (name: string, label: string, background: string): DemoFile => ({
  kind: "photo",
  name,
  bytes: () => demoPhotoJpeg({ label, background, exif: { latitude: 38.65, longitude: -98.25, camera: "Demo" } }),
});
export const document = (kind: AttachmentKind, name: string, title: string, lines: string[]): DemoFile => ({
  kind,
  name,
  bytes: async () => demoDocumentPdf(title, lines),
});

const FOR_A_RELEASE: DemoFile[] = [
  photo("runoff-at-inlet-demo.jpg", "Foam runoff reaching the curb inlet", "#50606b"),
  photo("containment-berm-demo.jpg", "Containment berm, east side", "#4b6b3c"),
  document("disposal_manifest", "hauler-manifest-demo.pdf", "Disposal manifest", [
    "Hauler: Alder Bend Liquid Waste (invented)",
    "Collected foam water: 300 gal, drums 1-6",
    "Manifest number: DEMO-MAN-0001",
  ]),
  document("lab_result", "pfas-sample-result-demo.pdf", "Lab result, runoff sample", [
    "Sample: storm inlet outfall, grab sample",
    "PFOA and PFOS: figures left out; this is not a laboratory report",
  ]),
];

const FOR_A_TEST: DemoFile[] = [
  document("test_printout", "proportioner-test-printout-demo.pdf", "Proportioner test printout", [
    "Set 0.5 %, measured 0.48 % by conductivity (invented figures)",
  ]),
];

export async function seed(knex: Knex): Promise<void> {
  const already = await knex("attachments").count({ n: "*" }).first();
  if (Number(already?.n ?? 0) > 0) return;
  const release = await knex("events")
    .whereIn("status", ["filed", "accepted"])
    .where("pfas_containing", true)
    .orderBy("started_at")
    .first("id", "created_by");
  const test = await knex("events")
    .whereIn("kind", ["test"])
    .whereIn("status", ["filed", "accepted"])
    .orderBy("started_at")
    .first("id", "created_by");
  const directory = await mkdtemp(path.join(tmpdir(), "foamtally-demo-attachments-"));
  try {
    for (const [event, files] of [
      [release, FOR_A_RELEASE],
      [test, FOR_A_TEST],
    ] as const) {
      if (!event) continue;
      for (const file of files) {
        if (!(await storeDemoFile(knex, directory, { subject: "event", id: event.id }, file, event.created_by))) {
          console.log("The file store is not running; demo attachments were not added.");
          return;
        }
      }
    }
  } finally {
    await rm(directory, { recursive: true, force: true });
  }
}

/**
 * Stores one demo file for an owner as an upload would (object first, then its row); false when the
 * file store is not running, with nothing written.
 */
export async function storeDemoFile(
  knex: Knex,
  directory: string,
  owner: AttachmentOwner,
  file: DemoFile,
  uploadedBy: number,
): Promise<boolean> {
  const received = path.join(directory, file.name);
  await writeFile(received, await file.bytes());
  const prepared = await prepareFile(received, { usePosition: false });
  const { storageKey, thumbnailKey } = attachmentKeys(owner, prepared);
  try {
    await putObjectFile(storageKey, prepared.path, prepared.byteSize, prepared.contentType);
    if (thumbnailKey && prepared.thumbnail) await putObject(thumbnailKey, prepared.thumbnail, "image/webp");
  } catch (error) {
    if (!(error instanceof StorageUnavailableError)) throw error;
    return false;
  } finally {
    await prepared.discard();
  }
  await knex("attachments").insert({
    subject: owner.subject,
    subject_id: owner.id,
    kind: file.kind,
    file_name: file.name,
    content_type: prepared.contentType,
    byte_size: prepared.byteSize,
    sha256: prepared.sha256,
    storage_key: storageKey,
    thumbnail_key: thumbnailKey,
    uploaded_by: uploadedBy,
  });
  return true;
}
