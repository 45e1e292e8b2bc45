import type { Knex } from "knex";
import { refreshFoamClassTotals } from "../../app/models/report-rows.server";
import { testKnex } from "../support/test-database";
import { expect, signInAs, test } from "../support/e2e";

// Invented events in 2020, a year the demo seed does not use, so the map shows only these.
const PERIOD = "from=2020-01-01&to=2020-12-31";
const CENTRE = { latitude: 38.7, longitude: -98.2 }; // the middle of the district's bounds (demo)
const NORTH_WEST = { latitude: 38.785, longitude: -98.305 };
const SOUTH_EAST = { latitude: 38.615, longitude: -98.095 };

let knex: Knex;

test.beforeAll(async () => {
  knex = testKnex();
  await knex("events").where("number", "like", "E2E-MAP-%").delete();
  const officer = await knex("users").where({ email: "officer@alderbend.example" }).first("id");
  const productFor = async (name: string, foamClass: "A" | "B", pfas: boolean) => {
    const found = await knex("foam_products").where({ name }).first("id");
    if (found) return found.id as number;
    const [id] = await knex("foam_products").insert({
      name,
      foam_class: foamClass,
      foam_type: foamClass === "A" ? "class-a" : "ar-afff",
      pfas_containing: pfas,
    });
    return id;
  };
  const classA = await productFor("E2E map Class A (test)", "A", false);
  const legacyB = await productFor("E2E map AR-AFFF (test)", "B", true);
  const events = [
    { key: "centre", at: CENTRE, product: classA, concentrate: 40, pfas: false, when: "2020-05-04T15:00:00Z" },
    { key: "north-west", at: NORTH_WEST, product: classA, concentrate: 6, pfas: false, when: "2020-06-10T15:00:00Z" },
    { key: "south-east", at: SOUTH_EAST, product: legacyB, concentrate: 9, pfas: true, when: "2020-07-21T15:00:00Z" },
  ];
  for (const event of events) {
    const water = 1000;
    const [id] = await knex("events").insert({
      number: `E2E-MAP-${event.key}`,
      kind: "incident",
      status: "accepted",
      started_at: new Date(event.when),
      address: `${event.key} (test)`,
      latitude: event.at.latitude,
      longitude: event.at.longitude,
      created_by: officer.id,
      water_gal: water,
      concentrate_gal: event.concentrate,
      solution_gal: water + event.concentrate,
      pfas_containing: event.pfas,
    });
    await knex("discharges").insert({
      event_id: id,
      position: 1,
      product_id: event.product,
      water_gal: water,
      concentrate_gal: event.concentrate,
      solution_gal: water + event.concentrate,
    });
    await refreshFoamClassTotals(knex, [id]);
  }
});

test.afterAll(async () => {
  await knex.destroy();
});

/** Share of canvas pixels that differ from the most common colour, and how many colours there are. */
async function canvasStats(page: import("@playwright/test").Page) {
  return page.evaluate(() => {
    const source = document.querySelector<HTMLCanvasElement>("[data-testid=usage-map] canvas");
    if (!source) return { differing: 0, colours: 0 };
    const copy = document.createElement("canvas");
    copy.width = source.width;
    copy.height = source.height;
    const context = copy.getContext("2d")!;
    context.drawImage(source, 0, 0);
    const pixels = context.getImageData(0, 0, copy.width, copy.height).data;
    const counts = new Map<number, number>();
    for (let i = 0; i < pixels.length; i += 4 * 7) {
      const key = (pixels[i] << 16) | (pixels[i + 1] << 8) | pixels[i + 2];
      counts.set(key, (counts.get(key) ?? 0) + 1);
    }
    const total = [...counts.values()].reduce((a, b) => a + b, 0);
    const commonest = Math.max(...counts.values());
    return { differing: (total - commonest) / total, colours: counts.size };
  });
}

test.describe("the chief's usage map", () => {
  test("draws the bundled tiles and the events, from the app's own origin only", async ({ page, baseURL }) => {
    const foreign: string[] = [];
    const origin = new URL(baseURL!).host;
    page.on("request", (request) => {
      const url = new URL(request.url());
      if ((url.protocol === "http:" || url.protocol === "https:") && url.host !== origin) foreign.push(url.href);
    });
    await signInAs(page, "chief");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Usage map" }).click();
    await expect(page.getByRole("heading", { name: "Usage map" })).toBeVisible();
    const map = page.getByTestId("usage-map");
    await expect(map).toHaveAttribute("data-state", "ready", { timeout: 30_000 });
    // The demo year (or the whole district) has markers on the default view.
    await expect(map).toHaveAttribute("data-markers", /^[1-9]\d*$/);

    const stats = await canvasStats(page);
    expect(stats.colours, "distinct colours on the map canvas").toBeGreaterThan(20);
    expect(stats.differing, "share of pixels that are not the background").toBeGreaterThan(0.05);

    await page.goto(`/map?${PERIOD}`);
    await expect(map).toHaveAttribute("data-state", "ready", { timeout: 30_000 });
    await expect(page.getByRole("region", { name: "Usage map" })).toBeVisible();
    expect(foreign, "requests to other hosts").toEqual([]);
  });

  test("shows a popup with the event's totals and a link to it", async ({ page }) => {
    await signInAs(page, "chief");
    await page.goto(`/map?${PERIOD}`);
    const map = page.getByTestId("usage-map");
    await expect(map).toHaveAttribute("data-state", "ready", { timeout: 30_000 });
    await expect(map).toHaveAttribute("data-markers", "3");
    // The map opens on the district's bounds, so the centre event sits in the middle of the map.
    await map.click({ position: await centreOf(map) });
    const popup = page.locator(".maplibregl-popup");
    await expect(popup).toContainText("E2E-MAP-centre");
    await expect(popup).toContainText("Concentrate40 gal");
    await expect(popup.getByRole("link", { name: "Open the event report" })).toHaveAttribute("href", /^\/events\/\d+$/);
  });

  test("the in-view totals follow the map", async ({ page }) => {
    await signInAs(page, "chief");
    await page.goto(`/map?${PERIOD}`);
    const map = page.getByTestId("usage-map");
    await expect(map).toHaveAttribute("data-state", "ready", { timeout: 30_000 });
    const concentrate = page.getByTestId("in-view-concentrate");
    await expect(page.getByRole("heading", { name: "In view", exact: true })).toBeVisible();
    await expect(concentrate).toHaveText("55 gal");
    await expect(page.getByText(/PFAS-containing events/)).toBeVisible();
    // Zooming in on the centre leaves the two corner events out of view.
    await page.getByRole("button", { name: "Zoom in" }).click();
    await page.getByRole("button", { name: "Zoom in" }).click();
    await expect(concentrate).toHaveText("40 gal");
    await expect(page.getByTestId("in-view-events")).toHaveText("1");
  });

  test("a filter change updates the in-view totals at once, and an empty list names the filter", async ({ page }) => {
    await signInAs(page, "chief");
    await page.goto(`/map?${PERIOD}`);
    const map = page.getByTestId("usage-map");
    await expect(map).toHaveAttribute("data-state", "ready", { timeout: 30_000 });
    const filters = page.getByRole("form", { name: "Map filters" });
    const concentrate = page.getByTestId("in-view-concentrate");
    const events = page.getByTestId("in-view-events");
    const listCount = page.getByTestId("events-in-view-count");
    await expect(page.getByRole("heading", { name: "In view", exact: true })).toBeVisible();
    await expect(concentrate).toHaveText("55 gal");

    // Class B only: the south-east event (9 gal), with the map where it was and no reload.
    await filters.getByLabel("Foam class").selectOption("B");
    await filters.getByRole("button", { name: "Show" }).click();
    await expect(page).toHaveURL(/class=B/);
    await expect(page.getByRole("heading", { name: "In view", exact: true })).toBeVisible();
    await expect(concentrate).toHaveText("9 gal");
    await expect(events).toHaveText("1");
    await expect(listCount).toContainText("1 event within the map and filters");

    // A filter that selects nothing says so, and does not blame the zoom.
    await filters.getByLabel("Kind").selectOption("training");
    await filters.getByRole("button", { name: "Show" }).click();
    await expect(events).toHaveText("0");
    await expect(concentrate).toHaveText("0 gal");
    await expect(listCount).toHaveText(/No events match these filters/);
    await expect(listCount).not.toContainText("Zoom");

    // With a matching event out of view, the list says to move the map instead.
    await filters.getByLabel("Kind").selectOption("");
    await filters.getByRole("button", { name: "Show" }).click();
    await expect(concentrate).toHaveText("9 gal");
    await page.getByRole("button", { name: "Zoom in" }).click();
    await page.getByRole("button", { name: "Zoom in" }).click();
    await expect(events).toHaveText("0");
    await expect(listCount).toHaveText(
      "The 1 event that matches the filters is not in view. Zoom out or move the map.",
    );
  });

  test("lists the events in view in a table that follows the map and leads to each event", async ({ page }) => {
    await signInAs(page, "chief");
    await page.goto(`/map?${PERIOD}`);
    const map = page.getByTestId("usage-map");
    await expect(map).toHaveAttribute("data-state", "ready", { timeout: 30_000 });
    const table = page.getByRole("table", { name: /within the map and filters/ });
    const rows = table.locator("tbody tr");
    await expect(table).toContainText("3 events");
    // Most concentrate first: centre 40 gal, south-east 9 gal (PFAS), north-west 6 gal.
    await expect(rows.locator("th")).toHaveText(["E2E-MAP-centre", "E2E-MAP-south-east", "E2E-MAP-north-west"]);
    await expect(rows.nth(0)).toContainText("May 4, 2020");
    await expect(rows.nth(0)).toContainText("40.0");
    await expect(rows.nth(1)).toContainText("PFAS-containing");
    await expect(rows.nth(1)).toContainText("Class B");

    // Zooming in on the centre leaves the corner events out of the list.
    await page.getByRole("button", { name: "Zoom in" }).click();
    await page.getByRole("button", { name: "Zoom in" }).click();
    await expect(table).toContainText("1 event within");
    await expect(rows.locator("th")).toHaveText(["E2E-MAP-centre"]);

    // Back out, then show a corner event from the list: the map flies there and opens its popup.
    await page.getByRole("button", { name: "Zoom out" }).click();
    await page.getByRole("button", { name: "Zoom out" }).click();
    await expect(rows).toHaveCount(3);
    await table.getByRole("button", { name: "Show on map: E2E-MAP-south-east" }).click();
    const popup = page.locator(".maplibregl-popup");
    await expect(popup).toContainText("E2E-MAP-south-east");
    await expect(popup).toContainText("PFAS-containing foam used");
    // Flown in to the event, the others drop out of the list.
    await expect(rows.locator("th")).toHaveText(["E2E-MAP-south-east"], { timeout: 10_000 });

    // The event number is a link to the event's report, reached with the keyboard.
    const link = rows.nth(0).getByRole("link", { name: "E2E-MAP-south-east" });
    await link.focus();
    await page.keyboard.press("Enter");
    await expect(page).toHaveURL(/\/events\/\d+$/);
    await expect(page.getByRole("heading", { level: 1 })).toContainText("E2E-MAP-south-east");
  });

  test("is not for a company officer", async ({ page, consoleErrors }) => {
    consoleErrors.allow(/status of 403/);
    await signInAs(page, "officer");
    const response = await page.goto("/map");
    expect(response?.status()).toBe(403);
  });
});

test.describe("drainage layers and the location check", () => {
  test("an environmental officer checks a point found by address, and a bad upload is refused", async ({
    page,
    consoleErrors,
  }) => {
    consoleErrors.allow(/status of 400/);
    await signInAs(page, "environmental");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Drainage layers" }).click();
    await expect(page.getByRole("heading", { name: "Drainage and waterway layers" })).toBeVisible();

    await page.getByLabel("Search an address").fill("105 main st");
    await page.getByRole("button", { name: "Find" }).click();
    await page.getByRole("button", { name: "105 Main Street" }).click();
    const checks = page.getByTestId("location-checks");
    await expect(checks).toContainText("South Fork");
    await expect(checks).toContainText("Alder Creek");
    await expect(page.getByLabel("Latitude (°N)")).toHaveValue(/^38\.7/);

    const status = page.getByTestId("layer-status-waterways");
    const before = await status.textContent();
    const card = page.getByRole("region", { name: "Waterways", exact: true });
    await card.getByLabel("New file for waterways").setInputFiles({
      name: "creeks.geojson",
      mimeType: "application/geo+json",
      buffer: Buffer.from(
        '{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"name":"X"},"geometry":{"type":"Point","coordinates":[-98.2,38.7]}}]}',
      ),
    });
    await card.getByRole("button", { name: "Replace waterways" }).click();
    await expect(card.getByRole("alert")).toContainText("is a Point");
    await expect(card.getByRole("alert")).toContainText("Nothing was changed");
    await expect(page.getByTestId("layer-status-waterways")).toHaveText(before!);
  });
});

async function centreOf(locator: import("@playwright/test").Locator) {
  const box = await locator.boundingBox();
  return { x: box!.width / 2, y: box!.height / 2 };
}
