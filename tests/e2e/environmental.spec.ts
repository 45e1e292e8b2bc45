import { readFileSync } from "node:fs";
import * as XLSX from "xlsx";
import { expect, signInAs, test } from "../support/e2e";

test.describe("quarterly runoff and PFAS summaries", () => {
  test("the environmental officer downloads a quarter's workbook and marks it submitted", async ({ page }) => {
    await signInAs(page, "environmental");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Quarterly summaries" }).click();
    await page.getByLabel("Year").selectOption("2026");
    await page.getByLabel("Quarter").selectOption("1");
    await page.getByRole("button", { name: "Show quarter" }).click();
    await expect(page.getByRole("heading", { name: /2026 Q1/ })).toBeVisible();
    await expect(page.getByText("These figures are estimates")).toBeVisible();

    const [download] = await Promise.all([
      page.waitForEvent("download"),
      page.getByRole("link", { name: "Download workbook (XLSX)" }).click(),
    ]);
    expect(download.suggestedFilename()).toBe("foam-runoff-summary_2026-Q1.xlsx");
    const book = XLSX.read(readFileSync(await download.path()));
    expect(book.SheetNames).toEqual([
      "Summary",
      "Events",
      "Discharges",
      "Releases",
      "Non-incident use",
      "PFAS",
      "Method and cautions",
    ]);
    const accepted = XLSX.utils
      .sheet_to_json<unknown[]>(book.Sheets.Summary, { header: 1 })
      .find((row) => row[0] === "Accepted reports in the period");
    await expect(page.getByText("Accepted reports counted").locator("..")).toContainText(String(accepted?.[1]));

    await page.getByLabel("Note (optional, e.g. where it was sent)").fill("Uploaded to the state portal (demo)");
    await page.getByRole("button", { name: "Mark 2026 Q1 submitted" }).click();
    await expect(page.getByText(/2026 Q1 marked submitted\. SHA-256 of the stored file: [0-9a-f]{64}/)).toBeVisible();
    await expect(page.getByRole("link", { name: "Download the submitted file" })).toBeVisible();
    await expect(page.getByRole("cell", { name: "2026 Q1" })).toBeVisible();
  });

  test("a company officer is refused the downloads", async ({ page }) => {
    await signInAs(page, "officer");
    const response = await page.request.get("/reports/environmental.xlsx?year=2026&quarter=1");
    expect(response.status()).toBe(403);
  });

  test("an invalid quarter is a clear 400", async ({ page }) => {
    await signInAs(page, "chief");
    const response = await page.request.get("/reports/environmental.csv?year=2026&quarter=6");
    expect(response.status()).toBe(400);
    expect(await response.text()).toContain("The quarter must be 1, 2, 3 or 4.");
  });

  test("the administrator reads the demo's release alert in the outbox", async ({ page }) => {
    await signInAs(page, "admin");
    await page.goto("/admin/outbox");
    await expect(page.getByRole("heading", { name: "Outbox (demo mode)" })).toBeVisible();
    await expect(
      page.getByRole("cell", { name: /Release alert: report AB-2025-\d+ — PFAS-containing foam/ }),
    ).toBeVisible();
  });
});
