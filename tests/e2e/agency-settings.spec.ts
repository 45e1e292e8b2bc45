import { expect, signInAs, test } from "../support/e2e";

test.describe("agency settings", () => {
  test("the administrator changes the mail recipients and the waterway buffer; the chief reads them", async ({
    page,
    consoleErrors,
  }) => {
    consoleErrors.allow(/status of 400/);
    await signInAs(page, "admin");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Agency settings" }).click();
    await expect(page.getByRole("heading", { name: "Agency settings" })).toBeVisible();
    // The cautions and the source of each default sit beside the figures.
    await expect(page.getByRole("note", { name: "Thresholds caution" })).toContainText("Local codes, permits");
    await expect(
      page.getByText(/300 ft: USDA Forest Service aerial application guide — local rules govern/),
    ).toBeVisible();
    await expect(
      page.getByText(/CERCLA reportable quantity for PFOA\/PFOS, 40 CFR 302.4 — state law may be stricter/),
    ).toBeVisible();

    const buffer = page.getByLabel("Waterway buffer (m)");
    const reportRecipients = page.getByLabel("Quarterly report recipients");
    await expect(buffer).toHaveValue("91.44");
    await expect(page.getByText("= 300 ft", { exact: true })).toBeVisible();

    // A bad address is named at its field and nothing is saved.
    await reportRecipients.fill("runoff-desk@alderbend.example, not an address");
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect(page.getByText("“not” is not an e-mail address.")).toBeVisible();

    // The public-records settings: the caution, each rule with its statute, a bad closure day at its field.
    await expect(page.getByRole("note", { name: "Public-records caution" })).toContainText("counsel");
    await expect(page.getByLabel("Due-date rule")).toContainText("5 ILCS 140/3");
    const closureDays = page.getByLabel("The agency's own closure days");
    const storedClosureDays = await closureDays.inputValue();
    await closureDays.fill("2026-12-24\n12/31/2026");
    await closureDays.blur();
    await expect(page.getByText("“12/31/2026” is not a date written YYYY-MM-DD.")).toBeVisible();
    await closureDays.fill(storedClosureDays);

    await reportRecipients.fill("runoff-desk@alderbend.example\nstate-desk@alderbend.example");
    await buffer.fill("30.48");
    await expect(page.getByText("= 100 ft", { exact: true })).toBeVisible();
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect(page.getByRole("status")).toContainText(
      /Agency settings saved\. The new waterway buffer rechecked \d+ events\./,
    );
    await expect(buffer).toHaveValue("30.48");
    await expect(reportRecipients).toHaveValue("runoff-desk@alderbend.example\nstate-desk@alderbend.example");

    await page.reload();
    await expect(buffer).toHaveValue("30.48");
    await page.getByRole("button", { name: "Sign out" }).click();
    await expect(page.getByRole("heading", { name: "Sign in to Foamtally" })).toBeVisible();

    await signInAs(page, "chief");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Agency settings" }).click();
    await expect(page.getByLabel("Waterway buffer (m)")).toHaveValue("30.48");
    await expect(page.getByLabel("Waterway buffer (m)")).toBeDisabled();
    await expect(page.getByLabel("Quarterly report recipients")).toHaveValue(
      "runoff-desk@alderbend.example\nstate-desk@alderbend.example",
    );
    await expect(page.getByRole("button", { name: "Save settings" })).toHaveCount(0);
    await expect(page.getByText("You can read these settings; an administrator changes them.")).toBeVisible();
    await page.getByRole("button", { name: "Sign out" }).click();
    await expect(page.getByRole("heading", { name: "Sign in to Foamtally" })).toBeVisible();

    // Put the demo values back for the stories that run after this one.
    await signInAs(page, "admin");
    await page.goto("/admin/settings");
    await page.getByLabel("Quarterly report recipients").fill("state-runoff-desk@alderbend.example");
    await page.getByLabel("Waterway buffer (m)").fill("91.44");
    await page.getByRole("button", { name: "Save settings" }).click();
    await expect(page.getByRole("status")).toContainText("Agency settings saved.");
    await expect(page.getByLabel("Waterway buffer (m)")).toHaveValue("91.44");
  });
});
