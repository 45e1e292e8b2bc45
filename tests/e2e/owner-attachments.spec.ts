import { demoDocumentPdf, demoPhotoJpeg } from "../../scripts/demo-files";
import { expect, signInAs, test } from "../support/e2e";
import { testKnex } from "../support/test-database";

/** The oldest accepted demo report of the officer's own station (S1): theirs to attach to and revise. */
async function acceptedReportAtS1(): Promise<number> {
  const knex = testKnex();
  try {
    const row = await knex("events")
      .join("stations", "stations.id", "events.station_id")
      .where({ "stations.code": "S1", "events.status": "accepted" })
      .orderBy("events.id", "asc")
      .first("events.id");
    if (!row) throw new Error("the demo seed has no accepted report at S1");
    return row.id;
  } finally {
    await knex.destroy();
  }
}

async function storedPoint(eventId: number): Promise<{ latitude: unknown; longitude: unknown }> {
  const knex = testKnex();
  try {
    return await knex("events").where({ id: eventId }).first("latitude", "longitude");
  } finally {
    await knex.destroy();
  }
}

/** A recorded accuracy test of the demo fleet, with its system. */
async function demoAccuracyTest(): Promise<{ id: number; systemId: number }> {
  const knex = testKnex();
  try {
    const row = await knex("foam_accuracy_tests").orderBy("id", "asc").first("id", "foam_system_id as systemId");
    if (!row) throw new Error("the demo seed has no accuracy test");
    return row;
  } finally {
    await knex.destroy();
  }
}

test.describe("files on tests and a photo's position", () => {
  test("the officer attaches a refractometer printout to an accuracy test and finds it listed", async ({ page }) => {
    const accuracyTest = await demoAccuracyTest();
    const name = `printout-${Date.now()}.pdf`;
    await signInAs(page, "officer");
    await page.goto(`/foam-systems/${accuracyTest.systemId}`);
    await page.getByRole("link", { name: "Test and printouts" }).first().click();
    await expect(page).toHaveURL(new RegExp(`/foam-systems/${accuracyTest.systemId}/tests/\\d+$`));
    const panel = page.getByTestId("attachments");
    await expect(panel.getByRole("heading", { name: "Printouts" })).toBeVisible();
    // A test takes printouts only: no kind to choose, no position to keep.
    await expect(panel.getByLabel("Kind of file")).toHaveCount(0);
    await panel.getByLabel("Attach test printouts").setInputFiles({
      name,
      mimeType: "application/pdf",
      buffer: Buffer.from(demoDocumentPdf("Refractometer printout", ["Sample: 3.1 % (invented)"])),
    });
    await expect(panel.getByTestId("upload").filter({ hasText: name })).toContainText("Attached");
    const card = panel.getByTestId("attachment").filter({ hasText: name });
    await expect(card).toContainText("Test printout");
    await page.reload();
    await expect(page.getByTestId("attachment").filter({ hasText: name })).toBeVisible();
  });

  test("a photo attached with its position offers that position on the report's edit page", async ({ page }) => {
    const eventId = await acceptedReportAtS1();
    const name = `swale-${Date.now()}.jpg`;
    const photo = await demoPhotoJpeg({
      label: "Runoff in the swale",
      exif: { latitude: 38.7131, longitude: -98.2011 },
    });
    await signInAs(page, "officer");
    await page.goto(`/events/${eventId}`);
    const panel = page.getByTestId("attachments");
    await panel.getByLabel("Keep each photo's recorded position with it").check();
    await panel.getByLabel("Attach files").setInputFiles({ name, mimeType: "image/jpeg", buffer: photo });
    await expect(panel.getByTestId("upload").filter({ hasText: name })).toContainText("Attached");

    await page.goto(`/events/${eventId}/edit`);
    const latitude = page.getByLabel("Latitude (°N)");
    const longitude = page.getByLabel("Longitude (°E, negative for west)");
    const stored = await storedPoint(eventId);
    expect(await latitude.inputValue()).not.toMatch(/^38\.713/);
    await page.getByRole("button", { name: `Use the position of ${name} for the event` }).click();
    // EXIF keeps degrees, minutes and seconds as fractions: the decimals past the fourth may differ.
    await expect(latitude).toHaveValue(/^38\.713\d*$/);
    await expect(longitude).toHaveValue(/^-98\.201\d*$/);
    await expect(page.getByTestId("photo-positions").getByRole("status")).toContainText("save the report to keep it");
    // Nothing is saved until the officer saves: the report keeps the point it had.
    expect(await storedPoint(eventId)).toEqual(stored);
  });
});
