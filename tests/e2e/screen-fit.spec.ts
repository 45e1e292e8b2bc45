// Every page of every demo role fits a tablet (820 × 1180) and a phone (390 × 844) without
// sideways scrolling. The page list is read from the app's own route list and access table, so a
// new page is covered the day it is added; a page with a parameter this file cannot fill fails.
import type { Browser, Page } from "@playwright/test";
import {
  changeCapabilityFor,
  decide,
  type Principal,
  type ReportStatus,
  type Role,
  ROUTE_ACCESS,
  rolesCan,
} from "~/lib/access";
import routes from "~/routes";
import { DEMO, type DemoRole, expect, signInAs, test } from "../support/e2e";
import { testKnex } from "../support/test-database";

const VIEWPORTS = [
  { name: "phone", width: 390, height: 844 },
  { name: "tablet", width: 820, height: 1180 },
] as const;

type RouteEntry = { path?: string; file: string };

/** Page routes (`.tsx` modules; `.ts` modules answer files and JSON) with the requirement of their GET. */
const PAGES = (routes as RouteEntry[])
  .filter((entry) => entry.file.endsWith(".tsx"))
  .map((entry) => {
    const key = entry.path ?? "";
    const requirement = ROUTE_ACCESS[key]?.GET;
    if (!requirement) throw new Error(`No GET entry in ROUTE_ACCESS for the page ${key}`);
    return { key, requirement };
  });

type Caller = DemoRole | "nobody";
const CALLERS: Caller[] = [...(Object.keys(DEMO) as DemoRole[]), "nobody"];

async function principalOf(role: DemoRole): Promise<Principal> {
  const knex = testKnex();
  try {
    const user = await knex("users").where({ email: DEMO[role] }).first("id", "station_id");
    const roles = (await knex("user_roles").where({ user_id: user.id }).pluck("role")) as Role[];
    return { id: user.id, roles, stationId: user.station_id ?? null };
  } finally {
    await knex.destroy();
  }
}

function mayOpen(principal: Principal | null, requirement: string): boolean {
  if (requirement === "public") return true;
  if (!principal) return false;
  if (requirement === "signed-in") return true;
  return rolesCan(principal.roles, requirement as Parameters<typeof rolesCan>[1]);
}

type ReportRow = { id: number; status: ReportStatus; created_by: number; station_id: number | null };

async function reports(): Promise<ReportRow[]> {
  const knex = testKnex();
  try {
    // Reports with the most lines first: the longest pages.
    return await knex("events")
      .leftJoin("discharges", "discharges.event_id", "events.id")
      .groupBy("events.id")
      .orderByRaw("count(discharges.id) desc, events.id desc")
      .select("events.id", "events.status", "events.created_by", "events.station_id");
  } finally {
    await knex.destroy();
  }
}

/** A report this principal may open at this route, as the access table decides on the record. */
async function reportFor(principal: Principal | null, key: string): Promise<number | null> {
  const requirement = ROUTE_ACCESS[key].GET!;
  for (const row of await reports()) {
    const record = { status: row.status, createdBy: row.created_by, stationId: row.station_id };
    const capability = key === "events/:id/edit" ? changeCapabilityFor(row.status) : requirement;
    if (capability === "signed-in" || capability === "public") return row.id;
    if (decide(principal, capability as "report.read", record) === "allow") return row.id;
  }
  return null;
}

async function firstValue(table: string, column: string): Promise<string | null> {
  const knex = testKnex();
  try {
    const row = await knex(table).orderBy("id").first(column);
    return row ? String(row[column]) : null;
  } finally {
    await knex.destroy();
  }
}

async function firstRow(table: string, columns: string[]): Promise<Record<string, unknown> | null> {
  const knex = testKnex();
  try {
    return (await knex(table).orderBy("id").first(columns)) ?? null;
  } finally {
    await knex.destroy();
  }
}

/** An earlier state to open: the first one stored, or one made now by revising an accepted report. */
async function revision(browser: Browser): Promise<{ id: string; revision: string } | null> {
  const stored = async () => {
    const knex = testKnex();
    try {
      return await knex("event_revisions").orderBy("id").first("event_id", "revision");
    } finally {
      await knex.destroy();
    }
  };
  let row = await stored();
  if (!row) {
    const officer = await principalOf("officer");
    const candidates = await reports();
    const accepted = candidates.find(
      (report) => report.status === "accepted" && report.station_id === officer.stationId,
    );
    if (!accepted) return null;
    const page = await browser.newPage();
    await signInAs(page, "officer");
    await page.goto(`/events/${accepted.id}/edit`);
    await page.getByRole("textbox", { name: "Reason for this revision" }).fill("Screen-fit check: an earlier state");
    await page.getByRole("button", { name: "File this revision" }).click();
    await expect(page).toHaveURL(new RegExp(`/events/${accepted.id}$`));
    await page.close();
    row = await stored();
  }
  return row ? { id: String(row.event_id), revision: String(row.revision) } : null;
}

/** The address of a page for this caller, or null when the demo data has no record for it. */
async function addressOf(key: string, principal: Principal | null, browser: Browser): Promise<string | null> {
  if (key === "*") return "/no-such-page-here";
  if (!key.includes(":")) return `/${key}`;
  const fill = async (): Promise<Record<string, string | null>> => {
    switch (key) {
      case "events/:id":
      case "events/:id/edit":
        return { id: String((await reportFor(principal, key)) ?? "") || null };
      case "events/:id/revisions/:revision": {
        const found = await revision(browser);
        return { id: found?.id ?? null, revision: found?.revision ?? null };
      }
      case "products/:productId":
        return { productId: await firstValue("foam_products", "id") };
      case "apparatus/:apparatusId":
        return { apparatusId: await firstValue("apparatus", "id") };
      case "stations/:stationId":
        return { stationId: await firstValue("stations", "id") };
      case "records/:id":
        return { id: await firstValue("records_requests", "id") };
      case "foam-systems/:systemId":
        return { systemId: await firstValue("foam_systems", "id") };
      case "apparatus/:apparatusId/foam-systems/:systemId": {
        const system = await firstRow("foam_systems", ["id", "apparatus_id"]);
        return {
          apparatusId: system ? String(system.apparatus_id) : null,
          systemId: system ? String(system.id) : null,
        };
      }
      case "foam-systems/:systemId/tests/:testId": {
        const found = await firstRow("foam_accuracy_tests", ["id", "foam_system_id"]);
        return { systemId: found ? String(found.foam_system_id) : null, testId: found ? String(found.id) : null };
      }
      case "reset-password/:token":
        // A link that was never sent: the page that says so must fit too.
        return { token: "a-link-that-was-never-sent" };
      case "records-requests/:trackingCode":
        return { trackingCode: await firstValue("records_requests", "tracking_code") };
      default:
        throw new Error(`The screen-fit test cannot open the page ${key}: teach addressOf its parameters.`);
    }
  };
  const values = await fill();
  let address = `/${key}`;
  for (const [name, value] of Object.entries(values)) {
    if (!value) return null;
    address = address.replace(`:${name}`, encodeURIComponent(value));
  }
  return address;
}

type Overflow = { scrollWidth: number; clientWidth: number; widest: string[]; hiddenMenuItems: number };

/** The page's sideways overflow, and the first elements that stick out (not those in a scroll box). */
async function horizontalOverflow(page: Page): Promise<Overflow> {
  return page.evaluate(async () => {
    await new Promise((resolve) => requestAnimationFrame(() => requestAnimationFrame(resolve)));
    const root = document.scrollingElement!;
    const limit = root.clientWidth;
    const scrollsInside = (element: Element) => {
      for (let parent = element.parentElement; parent && parent !== document.body; parent = parent.parentElement) {
        if (/(auto|scroll|hidden|clip)/.test(getComputedStyle(parent).overflowX)) return true;
      }
      return false;
    };
    const widest = Array.from(document.body.querySelectorAll<HTMLElement>("*"))
      .filter((element) => element.getBoundingClientRect().right > limit + 1 && !scrollsInside(element))
      .slice(0, 4)
      .map((element) => `${element.tagName.toLowerCase()}.${String(element.className).slice(0, 60)}`);
    // The menu wraps rather than scrolls: every item is in sight.
    const menu = document.querySelector('nav[aria-label="Main"]');
    const hiddenMenuItems = menu
      ? Array.from(menu.querySelectorAll("a")).filter((link) => link.getBoundingClientRect().right > limit + 1).length
      : 0;
    return { scrollWidth: root.scrollWidth, clientWidth: root.clientWidth, widest, hiddenMenuItems };
  });
}

test.describe("every page fits a tablet and a phone", () => {
  for (const caller of CALLERS) {
    test(`no sideways scrolling on any page open to ${caller === "nobody" ? "the public" : `the ${caller}`}`, async ({
      page,
      browser,
      consoleErrors,
    }) => {
      test.setTimeout(240_000);
      consoleErrors.allow(/status of (404|410)/);
      const principal = caller === "nobody" ? null : await principalOf(caller);
      if (caller !== "nobody") await signInAs(page, caller);
      const pages = PAGES.filter((entry) => mayOpen(principal, entry.requirement));
      expect(pages.length).toBeGreaterThan(1);
      const problems: string[] = [];
      let visited = 0;
      for (const entry of pages) {
        const address = await addressOf(entry.key, principal, browser);
        if (!address) {
          // The demo data always holds a record for these; a missing one is a broken fixture.
          problems.push(`${entry.key}: no demo record to open`);
          continue;
        }
        // Opened on the phone, then the same page turned to the tablet's width.
        for (const [index, viewport] of VIEWPORTS.entries()) {
          await page.setViewportSize({ width: viewport.width, height: viewport.height });
          if (index === 0) await page.goto(address);
          const overflow = await horizontalOverflow(page);
          if (overflow.scrollWidth > overflow.clientWidth) {
            problems.push(
              `${address} at ${viewport.name}: ${overflow.scrollWidth} > ${overflow.clientWidth} (${overflow.widest.join(", ")})`,
            );
          }
          if (overflow.hiddenMenuItems > 0) {
            problems.push(`${address} at ${viewport.name}: ${overflow.hiddenMenuItems} menu items out of sight`);
          }
          visited += 1;
        }
      }
      expect(visited).toBeGreaterThan(2);
      expect(problems).toEqual([]);
    });
  }
});
