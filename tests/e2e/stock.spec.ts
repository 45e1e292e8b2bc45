import { expect, signInAs, test } from "../support/e2e";

test.describe("the concentrate stock book", () => {
  test("receive a lot, refill a tank from it, file a report that uses it, count the store and see the variance", async ({
    browser,
  }) => {
    test.setTimeout(120_000);
    const lot = `E2E-${Date.now()}`;
    const store = "Millrace (demo) (S2) store";
    const keeper = await browser.newPage();
    await signInAs(keeper, "environmental");
    await keeper.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Concentrate stock" }).click();
    await expect(keeper.getByRole("heading", { name: "Readiness" })).toBeVisible();

    const receive = keeper.getByRole("form", { name: "Receive a delivery" });
    await receive.getByLabel("Into").selectOption({ label: `${store} (Station store)` });
    await receive.getByLabel("Product").selectOption({ label: "Bendwater Class A (demo) — Class A" });
    await receive.getByLabel("Lot number").fill(lot);
    await receive.getByLabel("Container size (gal)").fill("5");
    await receive.getByLabel("How many").fill("4");
    await receive.getByRole("button", { name: "Book the delivery" }).click();
    await expect(keeper.getByRole("status")).toHaveText(`Received 4 × 5 gal of lot ${lot}.`);
    await expect(keeper.getByRole("row", { name: new RegExp(lot) })).toContainText("20");

    await keeper.goto("/stock/movements");
    await keeper.getByLabel("Location", { exact: true }).selectOption({ label: store });
    await keeper.getByRole("button", { name: "Show" }).click();
    const move = keeper.getByRole("form", { name: `Move concentrate out of ${store}` });
    await move.getByLabel("To (for a transfer)").selectOption({ label: "E2 tank" });
    await move.getByLabel("Product").selectOption({ label: "Bendwater Class A (demo)" });
    await move.getByLabel("Lot").selectOption({ label: `${lot} — Bendwater Class A (demo), 20 gal` });
    // A negative quantity is refused at the field, nothing booked.
    await move.getByLabel("Quantity (gal)").fill("-4");
    await move.getByRole("button", { name: "Book the movement" }).click();
    await expect(move.getByText("Enter a quantity of more than 0 gallons.")).toBeVisible();
    // Leaving the field clears its message first, so the button does not move under the pointer.
    await move.getByLabel("Quantity (gal)").fill("10");
    await move.getByLabel("Quantity (gal)").press("Tab");
    await expect(move.getByText("Enter a quantity of more than 0 gallons.")).toHaveCount(0);
    await move.getByRole("button", { name: "Book the movement" }).click();
    await expect(keeper.getByRole("status")).toHaveText("Transferred: 10 gal booked.");

    // The officer files a report whose line drew 3 gal from E2's tank.
    const number = `STK-${Date.now()}`;
    const officer = await browser.newPage();
    await signInAs(officer, "officer");
    await officer.goto("/events/new");
    await officer.getByLabel("Event number").fill(number);
    await officer.getByLabel("Station").selectOption({ label: "S2 Millrace (demo)" });
    await officer.getByLabel("Started").fill("2026-11-28T10:00");
    await officer.getByLabel("Cleared").fill("2026-11-28T11:00");
    await officer.getByLabel("Address or location").fill("12 Depot St (demo)");
    await officer.getByLabel("Latitude (°N)").fill("38.7300");
    await officer.getByLabel("Longitude (°E, negative for west)").fill("-98.1600");
    const line = officer.getByRole("listitem", { name: "Discharge 1" });
    const engine2 = (await line.getByLabel("Apparatus").locator("option", { hasText: /^E2 / }).getAttribute("value"))!;
    await line.getByLabel("Apparatus").selectOption(engine2);
    await line.getByLabel("Concentrate").selectOption({ label: "Bendwater Class A (demo) (Class A)" });
    await line.getByLabel("Percent").fill("0.3");
    await line.getByLabel("Flow", { exact: true }).fill("100");
    await line.getByLabel("Minutes").fill("10");
    // 100 gpm of water at 0.3 % for 10 minutes: 3 gal of concentrate (computed by hand).
    await expect(officer.getByTestId("total-concentrate")).toHaveText("3 gal");
    await officer.getByLabel("Went to").selectOption("evaporated_unknown");
    await officer.getByRole("button", { name: "File report" }).click();
    await expect(officer.getByTestId("report-status")).toHaveText("Filed");

    await keeper.goto("/stock/movements");
    await keeper.getByLabel("Location", { exact: true }).selectOption({ label: "E2 tank" });
    await keeper.getByRole("button", { name: "Show" }).click();
    const used = keeper.getByRole("row", { name: new RegExp(number) });
    await expect(used).toContainText("Used on a report");
    await expect(used).toContainText("-3");

    // The store is counted: one litre-sized spill short, posted as an adjustment with its reason.
    await keeper.goto("/stock/counts");
    await keeper.getByLabel("Location", { exact: true }).selectOption({ label: store });
    await keeper.getByRole("button", { name: "Open" }).click();
    await keeper.getByLabel(`Counted gallons of Bendwater Class A (demo) lot ${lot}`).fill("9");
    await keeper.getByLabel("Reason for any difference").fill("One pail short at the shelf count (demo)");
    await keeper.getByRole("button", { name: "Record the count" }).click();
    await expect(keeper.getByRole("status")).toContainText("the variances were posted as adjustments");
    const counted = keeper.getByRole("row", { name: new RegExp(lot) }).last();
    await expect(counted).toContainText("-1");
  });
});
