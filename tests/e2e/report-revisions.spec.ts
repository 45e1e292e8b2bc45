import { expect, signInAs, test } from "../support/e2e";
import { testKnex } from "../support/test-database";

/** An accepted demo report of the officer's own station (S1), not yet revised. */
async function acceptedReportAtS1(): Promise<{ id: number; address: string }> {
  const knex = testKnex();
  try {
    return await knex("events")
      .join("stations", "stations.id", "events.station_id")
      .where({ "stations.code": "S1", "events.status": "accepted", "events.revision": 0 })
      .orderBy("events.id", "desc")
      .first("events.id", "events.address");
  } finally {
    await knex.destroy();
  }
}

test.describe("an amended report keeps its earlier state", () => {
  test("the officer revises an accepted report, then opens the state it replaced, marked superseded", async ({
    page,
  }) => {
    const report = await acceptedReportAtS1();
    expect(report).toBeTruthy();
    await signInAs(page, "officer");
    await page.goto(`/events/${report.id}`);
    await expect(page.getByTestId("revisions")).toHaveCount(0);
    await page.getByRole("link", { name: "Revise this report" }).click();
    await page.getByLabel("Address or location").fill(`${report.address} (corrected)`);
    await page.getByRole("textbox", { name: "Reason for this revision" }).fill("Dispatch gave the wrong block number");
    await page.getByRole("button", { name: "File this revision" }).click();
    await expect(page).toHaveURL(new RegExp(`/events/${report.id}$`));

    const revisions = page.getByTestId("revisions");
    await expect(revisions).toContainText("Revision 0");
    await expect(revisions).toContainText("Dispatch gave the wrong block number");
    await expect(revisions).toContainText("Lt. Rowan Keats (demo)");
    await revisions.getByRole("link", { name: "Revision 0" }).click();

    await expect(page).toHaveURL(new RegExp(`/events/${report.id}/revisions/0$`));
    const banner = page.getByTestId("superseded-banner");
    await expect(banner).toContainText("Earlier state, superseded");
    await expect(banner).toContainText("Dispatch gave the wrong block number");
    await expect(page.getByText(report.address, { exact: true })).toBeVisible();
    await expect(page.getByText(`${report.address} (corrected)`)).toHaveCount(0);
    await expect(page.getByRole("link", { name: "Revise this report" })).toHaveCount(0);
    await banner.getByRole("link", { name: "Open the current report" }).click();
    await expect(page).toHaveURL(new RegExp(`/events/${report.id}$`));
  });
});
