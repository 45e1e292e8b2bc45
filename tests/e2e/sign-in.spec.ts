import { DEMO, DEMO_PASSWORD, expect, signInAs, test } from "../support/e2e";

test.describe("signing in", () => {
  test("each demo role signs in and sees only its own navigation", async ({ page }) => {
    const expected: Record<keyof typeof DEMO, string[]> = {
      officer: ["Home", "New report", "Events", "Foam systems", "Concentrate stock"],
      environmental: [
        "Home",
        "Events",
        "To review",
        "Foam products",
        "Foam systems",
        "Usage map",
        "Drainage layers",
        "Quarterly summaries",
        "Concentrate stock",
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
        "Concentrate stock",
      ],
      records: ["Home", "Events", "Public-records requests"],
      admin: [
        "Home",
        "People and roles",
        "Agency settings",
        "Apparatus and stations",
        "Mail outbox",
        "Public-records requests",
      ],
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

  test("after a wrong password, one click on Sign in with the right one signs in", async ({ page, consoleErrors }) => {
    consoleErrors.allow(/status of 400/);
    await page.goto("/sign-in");
    await page.getByLabel("Email").fill(DEMO.records);
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    const refusal = page.getByRole("alert");
    await expect(refusal).toHaveText("The email or password is incorrect.");
    // The retry: type the right password and press the button once, the pointer's own way (the
    // password field loses focus between pressing and releasing).
    await page.getByLabel("Password").fill(DEMO_PASSWORD);
    const button = page.getByRole("button", { name: "Sign in" });
    const before = await button.boundingBox();
    await page.getByLabel("Password").blur();
    await expect(refusal).toHaveText("The email or password is incorrect.");
    expect(await button.boundingBox()).toEqual(before);
    await page.getByLabel("Password").focus();
    await button.click();
    await expect(page.getByRole("button", { name: "Sign out" })).toBeVisible();
    await expect(page).not.toHaveURL(/sign-in/);
  });

  test("an officer is refused the administrator page", async ({ page, consoleErrors }) => {
    consoleErrors.allow(/status of 403/);
    await signInAs(page, "officer");
    const response = await page.goto("/admin/users");
    expect(response?.status()).toBe(403);
    await expect(page.getByRole("heading", { name: "Not for your role" })).toBeVisible();
  });

  test("an officer following the workbook link gets the refusal page; a script keeps JSON", async ({
    page,
    consoleErrors,
  }) => {
    consoleErrors.allow(/status of 403/);
    await signInAs(page, "officer");
    const response = await page.goto("/reports/environmental.xlsx?year=2026&quarter=1");
    expect(response?.status()).toBe(403);
    expect(response?.headers()["content-type"]).toContain("text/html");
    await expect(page.getByRole("heading", { name: "Not for your role" })).toBeVisible();
    await expect(page.getByRole("link", { name: "Go to your home page" })).toBeVisible();
    const script = await page.request.get("/reports/environmental.xlsx?year=2026&quarter=1", {
      headers: { Accept: "application/json" },
    });
    expect(script.status()).toBe(403);
    expect(await script.json()).toEqual({ message: expect.stringContaining("roles") });
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
