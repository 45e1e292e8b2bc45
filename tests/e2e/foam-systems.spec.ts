import type { Page } from "@playwright/test";
import { expect, signInAs, test } from "../support/e2e";

/** Leaves a report being typed through the menu, answering the question about unsaved changes if asked. */
async function leaveReportFor(page: Page, menuItem: string) {
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: menuItem }).click();
  const question = page.getByRole("alertdialog", { name: "Leave this report?" });
  const arrived = page.getByRole("heading", { level: 1, name: menuItem });
  await expect(question.or(arrived)).toBeVisible();
  if (await question.isVisible()) await question.getByRole("button", { name: "Leave" }).click();
  await expect(arrived).toBeVisible();
}

async function openE3System(page: Page) {
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Foam systems" }).click();
  await page.getByRole("link", { name: "E3 · Class B direct injection" }).click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText("E3 · Class B direct injection");
}

/** A refractometer test at 3 % on the line reading = 2 × percent + 1 (hand-made mixes of 0, 1.5, 3 and 6 %). */
async function recordRefractometerTest(page: Page, when: string, sampleReading: string) {
  const form = page.getByRole("form", { name: "Record an accuracy test" });
  await form.getByLabel("When").fill(when);
  await form.getByLabel("Method").selectOption("refractometer");
  await form.getByLabel("Foam class").selectOption("B");
  await form.getByLabel("Rated percent").fill("3");
  const mixes: Array<[string, string]> = [
    ["0", "1"],
    ["1.5", "4"],
    ["3", "7"],
    ["6", "13"],
  ];
  for (const [index, [percent, reading]] of mixes.entries()) {
    await form.getByLabel(`Mix ${index + 1} percent`).fill(percent);
    await form.getByLabel(`Mix ${index + 1} reading`).fill(reading);
  }
  await form.getByLabel("Sample reading").fill(sampleReading);
  await form.getByRole("button", { name: "Record the test" }).click();
}

async function startLineOnE3(page: Page) {
  await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "New report" }).click();
  const line = page.getByRole("listitem", { name: "Discharge 1" });
  const engine3 = (await line.getByLabel("Apparatus").locator("option", { hasText: /^E3 / }).getAttribute("value"))!;
  await line.getByLabel("Apparatus").selectOption(engine3);
  await expect(line.getByLabel("Outlet")).toHaveValue("Crosslay 1");
  await line.getByLabel("Concentrate").selectOption({ label: "Millrace F3 3% (demo) (Class B)" });
  await expect(line.getByLabel("Percent")).toHaveValue("3");
  await line.getByLabel("Flow", { exact: true }).fill("150");
  await line.getByLabel("Minutes").fill("10");
  await expect(line.getByTestId("line-result")).toBeVisible();
  return line;
}

test.describe("proportioner care", () => {
  test("an officer records a flush and a failing test; the system is out of tolerance, its lines warn, and a passing retest clears it", async ({
    page,
  }) => {
    await signInAs(page, "officer");
    await openE3System(page);

    const maintenance = page.getByRole("form", { name: "Record maintenance" });
    await maintenance.getByLabel("What was done").selectOption("flush");
    await maintenance.getByLabel("Why it was flushed").selectOption("after_use");
    await maintenance.getByLabel("When").fill("2026-11-29T16:00");
    await maintenance.getByLabel("Notes").fill("Flushed after the Oak St call (demo story).");
    await maintenance.getByRole("button", { name: "Record maintenance" }).click();
    await expect(page.getByText("Flush recorded.")).toBeVisible();
    await expect(page.getByTestId("maintenance-row").first()).toContainText("Flush (after use)");

    // 9.2 on the line 2x + 1 reads as 4.1 % of solution: above NFPA 11's 3.0–3.9 % band for a 3 % rating.
    await recordRefractometerTest(page, "2026-11-30T09:00", "9.2");
    await expect(page.getByText("Test recorded: 4.1 % of solution, failed")).toBeVisible();
    await expect(page.getByTestId("system-status")).toContainText("Out of tolerance");
    await expect(page.getByTestId("test-row").first()).toContainText("Fail");

    const line = await startLineOnE3(page);
    await expect(line.getByTestId("line-foam-system")).toHaveText(
      "Foam system: Class B direct injection (out of tolerance)",
    );
    await expect(line.getByRole("note").filter({ hasText: "out of tolerance" })).toContainText(
      "until a passing retest",
    );

    // The line was only a look at the warning: leave the report unsaved.
    await leaveReportFor(page, "Foam systems");
    await page.getByRole("link", { name: "E3 · Class B direct injection" }).click();
    // 7.4 reads as 3.2 %: inside the band.
    await recordRefractometerTest(page, "2026-12-01T09:00", "7.4");
    await expect(page.getByText("Test recorded: 3.2 % of solution, passed.")).toBeVisible();
    await expect(page.getByTestId("system-status")).not.toContainText("Out of tolerance");

    const after = await startLineOnE3(page);
    await expect(after.getByTestId("line-foam-system")).toHaveText("Foam system: Class B direct injection");
    await expect(after.getByRole("note").filter({ hasText: "out of tolerance" })).toHaveCount(0);

    await leaveReportFor(page, "Foam systems");
    const row = page.getByTestId("fleet-row").filter({ hasText: "E3 · Class B direct injection" });
    await expect(row).toContainText("2026-12-01 · passed");
    // BR3's annual test fell due on 2025-11-18 + 12 months: it leads the fleet as overdue.
    await expect(page.getByTestId("fleet-row").first()).toContainText("BR3");
    await expect(page.getByTestId("fleet-row").first()).toContainText("Overdue");
  });
});
