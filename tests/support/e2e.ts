import { test as base, expect, type Page } from "@playwright/test";

export const DEMO_PASSWORD = "alder-bend-demo-2026";
export const DEMO = {
  officer: "officer@alderbend.example",
  environmental: "enviro@alderbend.example",
  chief: "chief@alderbend.example",
  records: "records@alderbend.example",
  admin: "admin@alderbend.example",
} as const;
export type DemoRole = keyof typeof DEMO;

export async function signInAs(page: Page, role: DemoRole) {
  await page.goto("/sign-in");
  await page.getByLabel("Email").fill(DEMO[role]);
  await page.getByLabel("Password").fill(DEMO_PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("navigation", { name: "Main" })).toBeVisible();
}

type ConsoleGuard = { allow: (pattern: RegExp) => void };

/**
 * Fails a test on any browser console error or page exception it did not expect. A test that
 * visits a page it expects to be refused says so: `consoleErrors.allow(/status of 403/)`.
 */
export const test = base.extend<{ consoleErrors: ConsoleGuard }>({
  consoleErrors: [
    async ({ page }, use) => {
      const errors: string[] = [];
      const allowed: RegExp[] = [];
      page.on("console", (message) => {
        if (message.type() === "error") errors.push(message.text());
      });
      page.on("pageerror", (error) => errors.push(error.message));
      await use({ allow: (pattern) => allowed.push(pattern) });
      const unexpected = errors.filter((text) => !allowed.some((pattern) => pattern.test(text)));
      expect(unexpected, "browser console errors").toEqual([]);
    },
    { auto: true },
  ],
});

export { expect };
