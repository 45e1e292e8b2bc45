// npm run files:sweep [-- --delete] [--purge] [--min-age-minutes 60]
// Lists the objects in the file store that no row names (orphans of a save that failed after its
// file was written) and, with --delete, deletes them. With --purge, also deletes the files of
// attachments removed longer ago than the agency's retention setting. Uses DB_NAME and S3_* as the app.
import { existsSync } from "node:fs";

if (existsSync(".env")) process.loadEnvFile(".env");

function option(name: string): string | undefined {
  const index = process.argv.indexOf(`--${name}`);
  return index >= 0 ? process.argv[index + 1] : undefined;
}

const minAgeMinutes = Number(option("min-age-minutes") ?? 60);
if (!Number.isFinite(minAgeMinutes) || minAgeMinutes < 0) {
  console.error("--min-age-minutes must be a number of minutes, 0 or more.");
  process.exit(1);
}
const remove = process.argv.includes("--delete");
const purge = process.argv.includes("--purge");

const { db } = await import("../app/lib/db.server");
const { deleteObject } = await import("../app/lib/storage.server");
const { findOrphanObjects, purgeRemovedAttachments } = await import("../app/models/attachments.server");

try {
  const orphans = await findOrphanObjects(new Date(Date.now() - minAgeMinutes * 60_000));
  console.log(`${orphans.length} stored files that no record names (older than ${minAgeMinutes} minutes):`);
  for (const orphan of orphans) {
    console.log(`  ${orphan.key}  ${orphan.storedAt?.toISOString() ?? "(time unknown)"}`);
    if (remove) await deleteObject(orphan.key);
  }
  if (remove && orphans.length) console.log(`Deleted ${orphans.length}.`);
  if (purge) {
    const result = await purgeRemovedAttachments();
    console.log(
      `Removed attachments past the retention setting: ${result.purged} deleted, ${result.failed} left for the next run.`,
    );
  }
} finally {
  await db.destroy();
}
