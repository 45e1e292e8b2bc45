import { expect, signInAs, test } from "../support/e2e";

test.describe("the records clerk's day", () => {
  test("a resident asks, the clerk answers with a redacted package, the mail arrives and the status says fulfilled", async ({
    page,
    browser,
  }) => {
    // Morning: a resident, without an account, asks for the foam records of March near the creek.
    const visitor = await browser.newPage();
    await visitor.goto("/records-requests");
    await visitor.getByLabel("Your name").fill("Jordan Reedley (demo)");
    await visitor.getByLabel("E-mail").fill("jordan.reedley@example.org");
    await visitor
      .getByLabel("Which records do you ask for?")
      .fill("Foam-usage reports from March 2026 near Willow Creek.");
    await visitor.getByLabel("From").fill("2026-03-01");
    await visitor.getByLabel("To").fill("2026-03-31");
    await visitor.getByRole("button", { name: "Send the request" }).click();
    await expect(visitor.getByRole("heading", { name: "Your request was received" })).toBeVisible();
    const trackingCode = (await visitor.getByTestId("tracking-code").textContent())!.trim();
    expect(trackingCode).toMatch(/^RR-[0-9A-Z]{5}-[0-9A-Z]{5}$/);
    await expect(visitor.getByTestId("request-status")).toHaveText("Received");

    // The clerk opens the queue from the home page: the demo's overdue request stands out.
    await signInAs(page, "records");
    await page.getByRole("link", { name: "Public-records requests: the queue and due dates" }).click();
    await expect(page.getByRole("heading", { name: "Public-records requests" })).toBeVisible();
    await expect(page.locator('tr[data-urgency="overdue"]').first()).toContainText("Overdue");
    await expect(page.locator('tr[data-urgency="due-soon"]').first()).toContainText("Due soon");

    // The new request: assign it, preview the records it asks for, build and send the package.
    await page.getByRole("link", { name: trackingCode }).click();
    await expect(page.getByText("jordan.reedley@example.org")).toBeVisible();
    await page.getByLabel("Assignee").selectOption({ label: "Priya Santos (demo)" });
    await page.getByRole("button", { name: "Assign" }).click();
    await expect(page.getByTestId("request-log")).toContainText("Assigned to Priya Santos (demo).");
    await page.getByRole("button", { name: "Preview" }).click();
    const preview = page.getByTestId("release-preview");
    await expect(preview).toBeVisible();
    await expect(preview).toContainText(/AB-2026-\d+/);
    await expect(preview).toContainText("block of");
    await page.getByRole("button", { name: "Build the package" }).click();
    const pack = page.getByTestId("release-package").first();
    // Building one PDF per report takes a while on a loaded machine.
    await expect(pack).toContainText("manifest.json", { timeout: 45_000 });
    await expect(pack).toContainText("cover-letter.pdf");
    await pack.getByRole("button", { name: "E-mail the package to the requester" }).click();
    await expect(page.getByTestId("status")).toHaveText("Fulfilled");
    await expect(page.getByTestId("request-log")).toContainText("e-mailed to the requester");

    // The mail with the package reaches the (fake) mail server.
    const admin = await browser.newPage();
    await signInAs(admin, "admin");
    await expect(async () => {
      await admin.goto("/admin/outbox");
      await expect(
        admin.getByRole("heading", { name: `Records released for your request ${trackingCode}` }),
      ).toBeVisible({
        timeout: 1_000,
      });
    }).toPass({ timeout: 20_000 });

    // The resident looks again: fulfilled.
    await visitor.goto(`/records-requests/${trackingCode}`);
    await expect(visitor.getByTestId("request-status")).toHaveText("Fulfilled");
  });

  test("a company officer is refused every records route", async ({ page, consoleErrors }) => {
    consoleErrors.allow(/status of 403/);
    await signInAs(page, "officer");
    for (const path of ["/records", "/api/records-requests"]) {
      const response = await page.request.get(path);
      expect(response.status(), path).toBe(403);
    }
  });
});
