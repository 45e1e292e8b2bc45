import { expect, signInAs, test } from "../support/e2e";

test.describe("people, roles and stations", () => {
  test("the chief manages people but cannot touch the administrator role; the administrator can", async ({ page }) => {
    await signInAs(page, "chief");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "People and roles" }).click();
    const create = page.getByRole("region", { name: "Add a person" });
    await expect(create.getByRole("checkbox", { name: "Company officer" })).toBeVisible();
    await expect(create.getByRole("checkbox", { name: "Administrator" })).toHaveCount(0);
    const adminRow = page.getByRole("row", { name: /admin@alderbend\.example/ });
    await expect(adminRow).toContainText("Only an administrator changes this account.");
    await expect(adminRow.getByRole("button")).toHaveCount(0);
    // The demo officer belongs to S1: the station decides which returned and accepted reports are theirs.
    await expect(page.getByLabel("Station of officer@alderbend.example")).toHaveValue(/\d+/);
    await page.getByRole("button", { name: "Sign out" }).click();

    await signInAs(page, "admin");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "People and roles" }).click();
    await expect(
      page.getByRole("region", { name: "Add a person" }).getByRole("checkbox", { name: "Administrator" }),
    ).toBeVisible();
    await expect(page.getByRole("button", { name: "Save admin@alderbend.example" })).toBeVisible();
  });

  test("the administrator's home offers no reports, and the report list is refused", async ({
    page,
    consoleErrors,
  }) => {
    consoleErrors.allow(/status of 403/);
    await signInAs(page, "admin");
    await expect(page.getByRole("region", { name: "Administrator" })).not.toContainText("usage reports");
    const response = await page.goto("/events");
    expect(response?.status()).toBe(403);
  });
});
