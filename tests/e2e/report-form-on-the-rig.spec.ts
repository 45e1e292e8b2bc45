import type { Page } from "@playwright/test";
import { expect, signInAs, test } from "../support/e2e";

/** The keys of report copies this browser keeps. */
async function keptCopies(page: Page): Promise<string[]> {
  return page.evaluate(() => Object.keys(localStorage).filter((key) => key.startsWith("foamtally:report-copy:")));
}

/** Reloads the page, answering the browser's "leave this page?" question; says whether it was asked. */
async function reloadLeaving(page: Page): Promise<boolean> {
  let asked = false;
  page.once("dialog", (dialog) => {
    asked = dialog.type() === "beforeunload";
    void dialog.accept();
  });
  await page.reload();
  return asked;
}

test.describe("a report form that survives the rig", () => {
  test("typing survives a reload and Back, is saved as a draft with its time, and leaves nothing behind", async ({
    page,
  }) => {
    const number = `RIG-${Date.now()}`;
    await signInAs(page, "officer");
    await page.goto("/events/new");
    await page.getByLabel("Event number").fill(number);
    await page.getByLabel("Address or location").fill("3 Tailboard Way (demo)");
    await page.getByLabel("Narrative").fill("Second line charged from the tender.");
    await page.getByLabel("Latitude (°N)").fill("38.7205");
    await page.getByRole("listitem", { name: "Discharge 1" }).getByLabel("Flow", { exact: true }).fill("150");
    await page.getByRole("button", { name: "Add a discharge" }).click();
    await page.getByRole("listitem", { name: "Discharge 2" }).getByLabel("Flow", { exact: true }).fill("80");
    await expect(page.getByTestId("save-state")).toContainText("Changes not saved yet");

    // A reload (a dropped connection, a tablet that slept) asks first, then offers the typing back.
    expect(await reloadLeaving(page)).toBe(true);
    const offer = page.getByRole("region", { name: "Unsaved typing kept on this device" });
    await expect(offer).toBeVisible();
    await expect(page.getByLabel("Event number")).toHaveValue("");
    await offer.getByRole("button", { name: "Bring back my typing" }).click();
    await expect(offer).toHaveCount(0);
    await expect(page.getByLabel("Event number")).toHaveValue(number);
    await expect(page.getByLabel("Address or location")).toHaveValue("3 Tailboard Way (demo)");
    await expect(page.getByLabel("Narrative")).toHaveValue("Second line charged from the tender.");
    await expect(page.getByLabel("Latitude (°N)")).toHaveValue("38.7205");
    await expect(page.getByRole("listitem", { name: "Discharge 2" }).getByLabel("Flow", { exact: true })).toHaveValue(
      "80",
    );

    // Leaving inside the app asks first; staying keeps everything; Back brings the offer again.
    const nav = page.getByRole("navigation", { name: "Main" });
    await nav.getByRole("link", { name: "Events" }).click();
    const leave = page.getByRole("alertdialog", { name: "Leave this report?" });
    await expect(leave).toBeVisible();
    await leave.getByRole("button", { name: "Stay on the report" }).click();
    await expect(page).toHaveURL(/\/events\/new$/);
    await expect(page.getByLabel("Event number")).toHaveValue(number);
    await nav.getByRole("link", { name: "Events" }).click();
    await leave.getByRole("button", { name: "Leave" }).click();
    await expect(page).toHaveURL(/\/events$/);
    await expect(page.getByRole("heading", { level: 1 })).not.toHaveText("New usage report");
    await page.goBack();
    await expect(page).toHaveURL(/\/events\/new$/);
    await offer.getByRole("button", { name: "Bring back my typing" }).click();
    await expect(page.getByRole("listitem", { name: "Discharge 1" }).getByLabel("Flow", { exact: true })).toHaveValue(
      "150",
    );

    // "Save draft" says it saved, and when; the copy of the new report is gone.
    await page.getByRole("button", { name: "Save draft" }).click();
    await expect(page.getByRole("status")).toHaveText(/Draft saved at \d{4}-\d{2}-\d{2} \d{2}:\d{2} \(America\//);
    await expect(page).toHaveURL(/\/events\/\d+\/edit$/);
    await expect(page.getByTestId("save-state")).toContainText(/Draft saved .*\(America\//);
    expect(await keptCopies(page)).toEqual([]);
    await page.reload();
    await expect(offer).toHaveCount(0);
    await expect(page.getByLabel("Event number")).toHaveValue(number);

    // A copy can be thrown away: the report shows as saved.
    await page.getByLabel("Address or location").fill("5 Tailboard Way (demo)");
    await expect(page.getByTestId("save-state")).toContainText("Changes not saved yet");
    expect(await reloadLeaving(page)).toBe(true);
    await offer.getByRole("button", { name: "Throw it away" }).click();
    await expect(page.getByLabel("Address or location")).toHaveValue("3 Tailboard Way (demo)");
    expect(await keptCopies(page)).toEqual([]);

    // Signing out leaves no one's typing on the device for the next person.
    await page.getByLabel("Narrative").fill("Typed, never saved.");
    await expect.poll(() => keptCopies(page)).toHaveLength(1);
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.getByRole("alertdialog", { name: "Leave this report?" }).getByRole("button", { name: "Leave" }).click();
    await expect(page).toHaveURL(/\/sign-in/);
    expect(await keptCopies(page)).toEqual([]);
  });

  test("a refused filing lists every problem at the top, each a link to its field, and the totals say what they leave out", async ({
    page,
  }) => {
    await signInAs(page, "officer");
    await page.goto("/events/new");
    await page.getByLabel("Event number").fill(`RIG-${Date.now()}`);
    const first = page.getByRole("listitem", { name: "Discharge 1" });
    const concentrate = await first.getByLabel("Concentrate").locator("option", { hasText: "Class A" }).first();
    await first.getByLabel("Concentrate").selectOption((await concentrate.getAttribute("value"))!);
    await first.getByLabel("Percent").fill("");
    const leftOut = page.getByTestId("totals-left-out");
    await expect(leftOut).toHaveText("Discharge 1 is left out of these totals: it has no valid flow.");

    await page.getByRole("button", { name: "File report" }).click();
    const summary = page.getByTestId("error-summary");
    await expect(summary).toBeFocused();
    // Field problems and the checks across fields arrive together, on the first attempt.
    for (const problem of [
      /Started: /,
      /Latitude \(°N\): Place the event on the map/,
      /Address or location: Enter the address or location\./,
      /Station: Choose the station\./,
      /Discharge 1 · Flow: /,
      /Discharge 1 · Percent: Enter the percent for a foam line\./,
      /Discharge 1 · Minutes: Enter a duration, or a start and end time\./,
    ]) {
      await expect(summary.getByRole("link", { name: problem })).toBeVisible();
    }
    await summary.getByRole("link", { name: /Discharge 1 · Flow: / }).click();
    await expect(first.getByLabel("Flow", { exact: true })).toBeFocused();

    await first.getByLabel("Flow", { exact: true }).fill("100");
    await expect(leftOut).toHaveText("Discharge 1 is left out of these totals: it has no valid duration.");
    await expect(summary.getByRole("link", { name: /Discharge 1 · Flow: / })).toHaveCount(0);
    await first.getByLabel("Minutes").fill("10");
    await expect(leftOut).toHaveText("Discharge 1 is left out of these totals: its concentrate has no valid percent.");
    await first.getByLabel("Percent").fill("0.5");
    await expect(leftOut).toHaveCount(0);
    // 100 gpm of water at 0.5 % for 10 min: 1,000 gal of water (computed by hand).
    await expect(page.getByTestId("total-water")).toHaveText("1,000 gal");
  });

  test("on a phone the sticky File/Save bar is opaque and never covers the field being typed in", async ({ page }) => {
    await page.setViewportSize({ width: 390, height: 844 });
    await signInAs(page, "officer");
    await page.goto("/events/new");
    const bar = page.locator(".report-actions");
    const background = await bar.evaluate((element) => getComputedStyle(element).backgroundColor);
    // No alpha channel: nothing shows through the bar.
    expect(background).not.toMatch(/\/|rgba|transparent/);
    await page.getByLabel("Event number").focus();
    let checked = 0;
    for (let step = 0; step < 40; step += 1) {
      await page.keyboard.press("Tab");
      const placement = await page.evaluate(() => {
        const focused = document.activeElement as HTMLElement | null;
        const actions = document.querySelector(".report-actions");
        if (!focused || !actions || actions.contains(focused) || !focused.matches("input, select, textarea")) {
          return null;
        }
        return {
          name: focused.getAttribute("name") ?? focused.id,
          bottom: focused.getBoundingClientRect().bottom,
          barTop: actions.getBoundingClientRect().top,
        };
      });
      if (!placement) continue;
      checked += 1;
      expect(placement.bottom, `${placement.name} is under the bar`).toBeLessThanOrEqual(placement.barTop);
    }
    expect(checked).toBeGreaterThan(10);
  });
});
