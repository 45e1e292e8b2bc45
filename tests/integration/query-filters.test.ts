// Filters in an address that cannot be used: a page leaves them out and says so, a download or
// an API call answers 400 naming them; never a 500, whatever the value.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { loader as apiEventsLoader } from "~/routes/api.events";
import { loader as apiMapEventsLoader } from "~/routes/api.map.events";
import { loader as apiRecordsLoader } from "~/routes/api.records-requests";
import { loader as apiMovementsLoader } from "~/routes/api.stock.movements";
import { loader as eventsLoader } from "~/routes/events._index";
import { loader as eventsCsvLoader } from "~/routes/events.csv";
import { loader as mapLoader } from "~/routes/map";
import { loader as recordsLoader } from "~/routes/records._index";
import { loader as countsLoader } from "~/routes/stock.counts";
import { loader as movementsLoader } from "~/routes/stock.movements";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency } from "../support/usage-fixtures";

type Loader = (args: never) => Promise<unknown>;

const MALFORMED = ["abc", "-1", "0", "1.5", "1e3", "0x10", " 1", "4294967296", "99999999999999999999", "%00"];
const IMPOSSIBLE_DAYS = ["2026-02-31", "2026-13-01", "0000-01-01", "9999-12-31", "31/03/2026"];

let cookie: string;
let locationId: number;

beforeAll(async () => {
  await ensureAgency();
  const user = await makeUser(["chief", "environmental", "records"], "Chief Filters");
  cookie = await signIn(user.email, TEST_PASSWORD);
  [locationId] = await db("stock_locations").insert({
    kind: "cache",
    name: `Filter cache ${randomUUID().slice(0, 6)}`,
  });
});

async function open(loader: Loader, path: string) {
  const outcome = await settle(() => loader(routeArgs(getRequest(path, { Cookie: cookie })) as never));
  const value = outcome.value as { init?: { status?: number } } | Response;
  const status = value instanceof Response ? value.status : (value.init?.status ?? 200);
  return { thrown: outcome.thrown, status, value };
}

describe("a page with a filter it cannot use", () => {
  it("shows the stock count page without a location, saying why, for every malformed location", async () => {
    for (const value of MALFORMED) {
      const page = await open(countsLoader, `/stock/counts?location=${encodeURIComponent(value)}`);
      expect({ value, thrown: page.thrown, status: page.status }).toEqual({ value, thrown: false, status: 200 });
      const data = page.value as { location: unknown; filterNote: string | null };
      expect(data.location).toBeNull();
      expect(data.filterNote).toMatch(/^Not filtered by location: Use a location from the list/);
    }
  });

  it("shows every movement, saying why, for a malformed location", async () => {
    for (const value of MALFORMED) {
      const page = await open(movementsLoader, `/stock/movements?location=${encodeURIComponent(value)}`);
      expect({ value, thrown: page.thrown, status: page.status }).toEqual({ value, thrown: false, status: 200 });
      const data = page.value as { location: unknown; filterNote: string | null };
      expect(data.location).toBeNull();
      expect(data.filterNote).toMatch(/Not filtered by location/);
    }
  });

  it("still opens a location the address names, and answers 404 for a well-formed id that names none", async () => {
    const named = await open(movementsLoader, `/stock/movements?location=${locationId}`);
    expect(named.status).toBe(200);
    expect(named.value).toMatchObject({ location: { id: locationId }, filterNote: null });
    const counted = await open(countsLoader, `/stock/counts?location=${locationId}`);
    expect(counted.value).toMatchObject({ location: { id: locationId }, filterNote: null });
    for (const loader of [countsLoader, movementsLoader]) {
      const missing = await open(loader, "/stock/counts?location=4294967295");
      expect(missing.thrown).toBe(true);
      expect(missing.status).toBe(404);
    }
  });

  it("lists events unfiltered by an impossible date or a malformed station, page or size, naming them", async () => {
    for (const value of IMPOSSIBLE_DAYS) {
      const page = await open(
        eventsLoader,
        `/events?from=${encodeURIComponent(value)}&to=${encodeURIComponent(value)}`,
      );
      expect({ value, thrown: page.thrown, status: page.status }).toEqual({ value, thrown: false, status: 200 });
      const data = page.value as { filters: { from?: string; to?: string }; errors: Record<string, string> };
      expect(data.filters.from).toBeUndefined();
      expect(data.filters.to).toBeUndefined();
      expect(data.errors).toEqual({ from: "Use a date like 2026-03-31.", to: "Use a date like 2026-03-31." });
    }
    for (const value of MALFORMED) {
      const query = encodeURIComponent(value);
      const page = await open(eventsLoader, `/events?station=${query}&page=${query}&size=${query}`);
      expect({ value, thrown: page.thrown, status: page.status }).toEqual({ value, thrown: false, status: 200 });
      const data = page.value as {
        filters: { stationId?: number; page: number; pageSize: number };
        filterNote: string | null;
      };
      expect(data.filters).toMatchObject({ stationId: undefined, page: 1, pageSize: 25 });
      expect(data.filterNote).toMatch(/^Not filtered by station, page, size: /);
    }
  });

  it("draws the map over its default period and every station when its filters cannot be used", async () => {
    const page = await open(mapLoader, "/map?from=2026-02-31&to=2026-03-31&station=0x10&class=C&kind=party");
    expect({ thrown: page.thrown, status: page.status }).toEqual({ thrown: false, status: 200 });
    const data = page.value as {
      filters: { from: string; to: string; stationId: string; foamClass: string; kind: string };
      filterNote: string;
    };
    expect(data.filters).toMatchObject({ stationId: "", foamClass: "", kind: "" });
    expect(data.filters.from).not.toBe("2026-02-31");
    expect(data.filterNote).toMatch(/^Not filtered by from, class, kind, station: /);
  });

  it("lists the open public-records requests, saying why, when the queue's filters cannot be used", async () => {
    for (const value of MALFORMED) {
      const query = encodeURIComponent(value);
      const page = await open(recordsLoader, `/records?assignee=${query}&status=${query}&sort=${query}`);
      expect({ value, thrown: page.thrown, status: page.status }).toEqual({ value, thrown: false, status: 200 });
      const data = page.value as { query: Record<string, unknown>; filterNote: string | null };
      expect(data.query).toEqual({ status: "open", assignee: undefined, sort: "due", dir: "asc" });
      expect(data.filterNote).toMatch(/^Not filtered by assignee, status, sort: /);
    }
    const unassigned = await open(recordsLoader, "/records?assignee=none&status=all&dir=desc");
    expect(unassigned.value).toMatchObject({
      query: { status: "all", assignee: "none", dir: "desc" },
      filterNote: null,
    });
  });
});

describe("a download or API call with a filter it cannot use", () => {
  const refusals: Array<[string, Loader, string, string]> = [
    ["the events CSV", eventsCsvLoader as Loader, "/events.csv", "from"],
    ["the events API", apiEventsLoader as Loader, "/api/events", "from"],
    ["the movements API", apiMovementsLoader as Loader, "/api/stock/movements", "from"],
  ];
  for (const [what, loader, path, name] of refusals) {
    it(`answers 400 from ${what} for an impossible date`, async () => {
      for (const value of IMPOSSIBLE_DAYS) {
        const answer = await open(loader, `${path}?${name}=${encodeURIComponent(value)}`);
        expect({ value, status: answer.status }).toEqual({ value, status: 400 });
      }
    });
  }

  it("answers 400 from the events API naming a station, page or size that is not a whole number", async () => {
    for (const value of MALFORMED) {
      const query = encodeURIComponent(value);
      const answer = await open(apiEventsLoader, `/api/events?station=${query}&page=${query}&size=${query}`);
      expect({ value, status: answer.status }).toEqual({ value, status: 400 });
      const body = await (answer.value as Response).json();
      expect(Object.keys(body.errors).sort()).toEqual(["page", "size", "station"]);
    }
  });

  it("answers 400 from the map's API for a station that is not a record id", async () => {
    for (const value of MALFORMED) {
      const answer = await open(
        apiMapEventsLoader,
        `/api/map/events?from=2026-01-01&to=2026-03-31&station=${encodeURIComponent(value)}`,
      );
      expect({ value, status: answer.status }).toEqual({ value, status: 400 });
    }
  });

  it("answers 400 from the public-records API naming an assignee that is not a person's id", async () => {
    const answer = await open(apiRecordsLoader, "/api/records-requests?assignee=1e3&status=open");
    expect(answer.status).toBe(400);
    expect((await (answer.value as Response).json()).errors).toEqual({
      assignee: "Use a person from the list (a record id, a whole number).",
    });
    expect((await open(apiRecordsLoader, "/api/records-requests?assignee=none")).status).toBe(200);
  });
});
