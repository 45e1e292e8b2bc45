import { demoDocumentPdf, demoPhotoJpeg } from "../../scripts/demo-files";
import { DEMO, expect, signInAs, test } from "../support/e2e";
import { testKnex } from "../support/test-database";

/** A report the demo officer wrote and filed, so that they may attach files to it. */
async function officersFiledReport(): Promise<number> {
  const knex = testKnex();
  try {
    const row = await knex("events")
      .join("users", "users.id", "events.created_by")
      .where({ "users.email": DEMO.officer })
      .whereIn("events.status", ["filed", "accepted"])
      .orderBy("events.id", "desc")
      .first("events.id");
    if (!row) throw new Error("the demo seed has no filed report of the demo officer");
    return row.id;
  } finally {
    await knex.destroy();
  }
}

async function setLargestFile(megabytes: number) {
  const knex = testKnex();
  try {
    await knex("agency_settings").where({ id: 1 }).update({ attachment_max_mb: megabytes });
  } finally {
    await knex.destroy();
  }
}

test.describe("attachments on a report", () => {
  test("the officer attaches a scene photo and a manifest at once and sees the photo's thumbnail", async ({
    page,
    consoleErrors,
  }) => {
    consoleErrors.allow(/status of (400|413)/);
    const eventId = await officersFiledReport();
    const photo = await demoPhotoJpeg({ label: "Foam at the curb inlet", exif: { latitude: 38.71, longitude: -98.2 } });
    const name = `scene-${Date.now()}.jpg`;
    await signInAs(page, "officer");
    await page.goto(`/events/${eventId}`);
    const panel = page.getByTestId("attachments");
    await expect(panel.getByRole("heading", { name: "Attachments" })).toBeVisible();

    await panel.getByLabel("Attach files").setInputFiles([
      { name, mimeType: "image/jpeg", buffer: photo },
      {
        name: "hauler-manifest.pdf",
        mimeType: "application/pdf",
        buffer: Buffer.from(demoDocumentPdf("Hauler manifest", ["Collected foam water, 300 gal (invented)"])),
      },
    ]);
    const uploads = panel.getByTestId("upload");
    await expect(uploads.filter({ hasText: name })).toContainText("Attached");
    await expect(uploads.filter({ hasText: "hauler-manifest.pdf" })).toContainText("Attached");

    const thumbnail = panel.getByRole("img", { name: `Thumbnail of ${name}` });
    await expect(thumbnail).toBeVisible();
    await expect
      .poll(() => thumbnail.evaluate((image: HTMLImageElement) => image.complete && image.naturalWidth))
      .toBeGreaterThan(0);
    const card = panel.getByTestId("attachment").filter({ hasText: name });
    await expect(card).toContainText("Scene photo");

    // A program under a photo's name is refused by its content, and the panel says why.
    await panel.getByLabel("Attach files").setInputFiles({
      name: "not-a-photo.jpg",
      mimeType: "image/jpeg",
      buffer: Buffer.concat([Buffer.from("MZ"), Buffer.alloc(2000)]),
    });
    const refused = uploads.filter({ hasText: "not-a-photo.jpg" });
    await expect(refused).toContainText("Not attached");
    await expect(refused.getByRole("alert")).toContainText("Attach JPEG, PNG, WebP or HEIC photos and PDF documents");
    await expect(refused.getByRole("button", { name: "Try again" })).toBeVisible();

    // A file past the agency's limit is refused before it is read, and the limit is named.
    await setLargestFile(1);
    try {
      await panel.getByLabel("Attach files").setInputFiles({
        name: "long-video-still.jpg",
        mimeType: "image/jpeg",
        buffer: Buffer.concat([photo, Buffer.alloc(3 * 1024 * 1024)]),
      });
      const tooLarge = uploads.filter({ hasText: "long-video-still.jpg" });
      await expect(tooLarge.getByRole("alert")).toHaveText(
        "The file is larger than 1 MB, the most the agency settings allow.",
      );
    } finally {
      await setLargestFile(25);
    }

    await panel.getByRole("button", { name: "Remove hauler-manifest.pdf" }).click();
    await expect(panel.getByTestId("attachment").filter({ hasText: "hauler-manifest.pdf" })).toHaveCount(0);
    await expect(card).toBeVisible();
  });
});
