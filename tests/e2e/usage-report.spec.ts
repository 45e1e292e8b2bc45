import { expect, signInAs, test } from "../support/e2e";
import { testKnex } from "../support/test-database";

async function proportionerMaximum(unitId: string): Promise<number> {
  const knex = testKnex();
  try {
    const row = await knex("apparatus").where({ unit_id: unitId }).first("proportioner_max_concentrate_gpm");
    return Number(row.proportioner_max_concentrate_gpm);
  } finally {
    await knex.destroy();
  }
}

test.describe("a usage report from filing to acceptance", () => {
  test("the officer files, the environmental officer returns, the officer fixes, the report is accepted", async ({
    browser,
  }) => {
    const number = `E2E-${Date.now()}`;
    const officer = await browser.newPage();
    await signInAs(officer, "officer");
    await officer.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "New report" }).click();
    await officer.getByLabel("Event number").fill(number);
    await officer.getByLabel("Station").selectOption({ label: "S2 Millrace (demo)" });
    await officer.getByLabel("Started").fill("2026-11-20T14:05");
    await officer.getByLabel("Cleared").fill("2026-11-20T15:30");
    await officer.getByLabel("Address or location").fill("400 Heron Pond Rd (demo)");
    await officer.getByLabel("Latitude (°N)").fill("38.7210");
    await officer.getByLabel("Longitude (°E, negative for west)").fill("-98.1720");

    const first = officer.getByRole("listitem", { name: "Discharge 1" });
    const engine2 = (await first.getByLabel("Apparatus").locator("option", { hasText: /^E2 / }).getAttribute("value"))!;
    await first.getByLabel("Apparatus").selectOption(engine2);
    await first.getByLabel("Concentrate").selectOption({ label: "Bendwater Class A (demo) (Class A)" });
    await expect(first.getByLabel("Percent")).toHaveValue("0.3");
    await first.getByLabel("Flow", { exact: true }).fill("100");
    await first.getByLabel("Minutes").fill("10");

    // 100 gpm water at 0.3 % for 10 min: 1,000 gal water, 3 gal concentrate (computed by hand).
    const totals = officer.getByTestId("live-totals");
    await expect(officer.getByTestId("total-concentrate")).toHaveText("3 gal");
    await first.getByLabel("Flow", { exact: true }).fill("200");
    await expect(officer.getByTestId("total-concentrate")).toHaveText("6 gal");
    await expect(officer.getByTestId("total-water")).toHaveText("2,000 gal");

    await officer.getByRole("button", { name: "Add a discharge" }).click();
    const second = officer.getByRole("listitem", { name: "Discharge 2" });
    await second.getByLabel("Apparatus").selectOption(engine2);
    await second.getByLabel("Concentrate").selectOption({ label: "Bendwater Class A (demo) (Class A)" });
    await second.getByLabel("Percent").fill("1");
    await second.getByLabel("Flow", { exact: true }).fill("300");
    await second.getByLabel("Minutes").fill("5");
    // E2's proportioner tops out below the 3 gpm of concentrate that 300 gpm at 1 % needs, so the
    // line reaches maximum ÷ 300 gpm and injects maximum × 5 min.
    const maximum = await proportionerMaximum("E2");
    expect(maximum).toBeLessThan(3);
    const effective = Number(((maximum / 300) * 100).toFixed(3));
    const expectedTotal = (6 + maximum * 5).toLocaleString("en-US", { maximumFractionDigits: 2 });
    await expect(second.getByRole("note")).toContainText(`effective percentage was about ${effective} %`);
    await expect(first.getByRole("note")).toHaveCount(0);
    await expect(totals).toContainText(`${expectedTotal} gal`);

    await officer.getByLabel("Went to").selectOption("storm_drain");
    await officer.getByRole("button", { name: "File report" }).click();
    await expect(officer.getByRole("status")).toHaveText(/Report filed/);
    await expect(officer.getByTestId("report-status")).toHaveText("Filed");
    const reportUrl = officer.url();

    const enviro = await browser.newPage();
    await signInAs(enviro, "environmental");
    await enviro.goto(reportUrl);
    await enviro.getByLabel("Comment for the officer").fill("Give the outlet for each line.");
    await enviro.getByRole("button", { name: "Return with comment" }).click();
    await expect(enviro.getByTestId("report-status")).toHaveText("Returned");

    await officer.goto("/");
    const returned = officer.getByRole("region", { name: "Returned to you for changes" });
    await expect(returned).toContainText("Give the outlet for each line.");
    await returned.getByRole("link", { name: number }).click();
    await officer.getByRole("listitem", { name: "Discharge 1" }).getByLabel("Outlet").fill("Crosslay 1");
    await officer.getByRole("listitem", { name: "Discharge 2" }).getByLabel("Outlet").fill("Front bumper line");
    await officer.getByRole("button", { name: "File report" }).click();
    await expect(officer.getByTestId("report-status")).toHaveText("Filed");

    await enviro.goto(reportUrl);
    await enviro.getByRole("button", { name: "Accept report" }).click();
    await expect(enviro.getByTestId("report-status")).toHaveText("Accepted");
    const history = enviro.getByTestId("history");
    await expect(history.getByRole("listitem")).toHaveText([
      /Filed the report/,
      /Returned the report.*Give the outlet/s,
      /Filed the report/,
      /Accepted the report/,
    ]);
    await expect(enviro.getByTestId("saved-totals")).toContainText(`${expectedTotal} gal`);
  });
});
