import { expect, signInAs, test } from "../support/e2e";

test.describe("a flush that flowed", () => {
  test("an officer records a flush with its water and concentrate; its usage report is filed and linked from the flush", async ({
    page,
  }) => {
    await signInAs(page, "officer");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Foam systems" }).click();
    await page.getByRole("link", { name: "BR3 · Class A injection" }).click();
    await expect(page.getByRole("heading", { level: 1 })).toHaveText("BR3 · Class A injection");

    const maintenance = page.getByRole("form", { name: "Record maintenance" });
    await maintenance.getByLabel("What was done").selectOption("flush");
    await maintenance.getByLabel("Why it was flushed").selectOption("after_use");
    await maintenance.getByLabel("When").fill("2026-01-12T10:00");
    await maintenance.getByLabel("Water used (gal)").fill("30");
    await maintenance.getByLabel("Concentrate sent to disposal (gal)").fill("0.5");
    await maintenance.getByLabel("Notes").fill("Flushed after the grass fire (demo story).");
    await maintenance.getByRole("button", { name: "Record maintenance" }).click();
    await expect(page.getByText(/Flush recorded, with its usage report \S+ filed/)).toBeVisible();

    const row = page.getByTestId("maintenance-row").filter({ hasText: "grass fire" });
    await expect(row).toContainText("30 gal / 0.5 gal");
    await row.getByRole("link").click();
    await expect(page).toHaveURL(/\/events\/\d+$/);
    await expect(page.getByText("the apparatus's station").first()).toBeVisible();
  });
});
