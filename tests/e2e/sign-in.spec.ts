import { DEMO, DEMO_PASSWORD, expect, signInAs, test } from "../support/e2e";

test.describe("signing in", () => {
  test("each demo role signs in and sees only its own navigation", async ({ page }) => {
    const expected: Record<keyof typeof DEMO, string[]> = {
      officer: ["Home", "New report", "Events", "Foam systems"],
      environmental: [
        "Home",
        "Events",
        "To review",
        "Foam products",
        "Foam systems",
        "Usage map",
        "Drainage layers",
        "Quarterly summaries",
      ],
      chief: [
        "Home",
        "Events",
        "To review",
        "People and roles",
        "Agency settings",
        "Foam products",
        "Apparatus and stations",
        "Foam systems",
        "Usage map",
        "Quarterly summaries",
      ],
      records: ["Home", "Events"],
      admin: ["Home", "People and roles", "Agency settings", "Apparatus and stations", "Mail outbox"],
    };
    for (const role of Object.keys(expected) as (keyof typeof DEMO)[]) {
      await signInAs(page, role);
      await expect(page.getByRole("navigation", { name: "Main" }).getByRole("link")).toHaveText(expected[role]);
      await page.getByRole("button", { name: "Sign out" }).click();
      await expect(page.getByRole("heading", { name: "Sign in to Foamtally" })).toBeVisible();
    }
  });

  test("a wrong password shows the message and keeps the email", async ({ page, consoleErrors }) => {
    consoleErrors.allow(/status of 400/);
    await page.goto("/sign-in");
    await page.getByLabel("Email").fill(DEMO.officer);
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("alert")).toHaveText("The email or password is incorrect.");
    await expect(page.getByLabel("Email")).toHaveValue(DEMO.officer);
    await expect(page.getByLabel("Password")).toHaveValue("");
  });

  test("an officer is refused the administrator page", async ({ page, consoleErrors }) => {
    consoleErrors.allow(/status of 403/);
    await signInAs(page, "officer");
    const response = await page.goto("/admin/users");
    expect(response?.status()).toBe(403);
    await expect(page.getByRole("heading", { name: "Not for your role" })).toBeVisible();
  });

  test("signing out ends the session", async ({ page, consoleErrors }) => {
    consoleErrors.allow(/status of 401/);
    await signInAs(page, "chief");
    await page.getByRole("button", { name: "Sign out" }).click();
    await expect(page.getByRole("heading", { name: "Sign in to Foamtally" })).toBeVisible();
    await page.goto("/admin/users");
    await expect(page).toHaveURL(/\/sign-in\?redirectTo=%2Fadmin%2Fusers/);
    const me = await page.request.get("/api/me");
    expect(me.status()).toBe(401);
  });

  test("an address that is not a page gets the friendly 404", async ({ page, consoleErrors }) => {
    consoleErrors.allow(/status of 404/);
    await signInAs(page, "records");
    const response = await page.goto("/no/such/page");
    expect(response?.status()).toBe(404);
    await expect(page.getByRole("heading", { name: "Not found" })).toBeVisible();
  });

  test("a write from another site is refused", async ({ request }) => {
    const response = await request.post("/sign-in", {
      form: { email: DEMO.officer, password: DEMO_PASSWORD },
      headers: { Origin: "http://elsewhere.example" },
    });
    expect(response.status()).toBe(403);
  });
});
