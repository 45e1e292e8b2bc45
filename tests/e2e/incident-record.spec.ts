import { expect, signInAs, test } from "../support/e2e";

test.describe("the incident record on the report form", () => {
  test("an officer files a vehicle fire under its dispatch number, with a mutual-aid line, and finds it by that number", async ({
    page,
  }) => {
    const dispatch = `26-E2E${Date.now().toString().slice(-6)}`;
    await signInAs(page, "officer");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "New report" }).click();
    const menu = page.getByRole("navigation", { name: "Main" });
    await expect(menu.locator("[aria-current=page]")).toHaveText(["New report"]);

    // Started and Cleared sit level with each other.
    const started = await page.getByLabel("Started").boundingBox();
    const cleared = await page.getByLabel("Cleared").boundingBox();
    expect(Math.round(cleared!.y)).toBe(Math.round(started!.y));

    await page.getByLabel("Dispatch (CAD) number").fill(dispatch);
    await page.getByLabel("Incident type").selectOption({ label: "Vehicle fire" });
    await page.getByLabel("Station").selectOption({ label: "S2 Millrace (demo)" });
    await page.getByLabel("Started").fill("2026-11-21T14:05");
    await page.getByLabel("Cleared").fill("2026-11-21T15:30");
    await page.getByLabel("Address or location").fill("County Road 12 at the grain elevator (demo)");
    await page.getByLabel("Latitude (°N)").fill("38.7210");
    await page.getByLabel("Longitude (°E, negative for west)").fill("-98.1720");

    const ours = page.getByRole("listitem", { name: "Discharge 1" });
    const engine2 = (await ours.getByLabel("Apparatus").locator("option", { hasText: /^E2 / }).getAttribute("value"))!;
    await ours.getByLabel("Apparatus").selectOption(engine2);
    await ours.getByLabel("Concentrate").selectOption({ label: "Bendwater Class A (demo) (Class A)" });
    await ours.getByLabel("Percent").fill("1");
    await ours.getByLabel("Flow", { exact: true }).fill("300");
    await ours.getByLabel("Minutes").fill("5");
    await expect(ours.getByRole("note")).toContainText("effective percentage");

    // The same figures from another agency's unit: counted, but no proportioner of ours to check.
    await page.getByRole("button", { name: "Add a discharge" }).click();
    const theirs = page.getByRole("listitem", { name: "Discharge 2" });
    await theirs.getByLabel("Another agency's unit (mutual aid)").check();
    await expect(theirs.getByLabel("Apparatus")).toHaveCount(0);
    await theirs.getByLabel("Mutual-aid agency").fill("Cedar Ford Fire Protection District (demo)");
    await theirs.getByLabel("Concentrate").selectOption({ label: "Bendwater Class A (demo) (Class A)" });
    await theirs.getByLabel("Percent").fill("1");
    await theirs.getByLabel("Flow", { exact: true }).fill("300");
    await theirs.getByLabel("Minutes").fill("5");
    // 300 gpm water at 1 % of the water for 5 min: 15 gal concentrate (common practice, no source).
    await expect(theirs.getByTestId("line-result")).toContainText("concentrate 15 gal");
    await expect(theirs.getByRole("note")).toHaveCount(0);

    // The unit id is needed: refused at its field, typing kept.
    await page.getByLabel("Went to").selectOption("soil");
    await page.getByRole("button", { name: "File report" }).click();
    await expect(theirs.getByText("Give the mutual-aid unit's id")).toBeVisible();
    await expect(theirs.getByLabel("Mutual-aid agency")).toHaveValue("Cedar Ford Fire Protection District (demo)");
    await theirs.getByLabel("Their unit id").fill("BR61");
    await page.getByRole("button", { name: "File report" }).click();
    await expect(page.getByRole("status")).toHaveText(/Report filed/);
    await expect(page.getByText("Vehicle fire", { exact: true })).toBeVisible();
    await expect(page.getByText(dispatch, { exact: true })).toBeVisible();
    await expect(page.getByText("Mutual aid: Cedar Ford Fire Protection District (demo) BR61")).toBeVisible();

    await page.goto(`/events?dispatch=${encodeURIComponent(dispatch.slice(3))}&type=vehicle_fire`);
    const rows = page.locator("table.data-table tbody tr");
    await expect(rows).toHaveCount(1);
    await expect(rows.first()).toContainText("Vehicle fire");
    await expect(rows.first()).toContainText(dispatch);
    await expect(page.getByRole("navigation", { name: "Main" }).locator("[aria-current=page]")).toHaveText(["Events"]);
  });
});
