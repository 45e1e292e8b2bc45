import { beforeAll, describe, expect, it } from "vitest";
import { ProductFormSchema } from "~/lib/catalogue/product-form";
import { db } from "~/lib/db.server";
import type { SessionUser } from "~/lib/auth.server";
import { currentDataVersions } from "~/models/data-version.server";
import { listTotals, parseEventFilters } from "~/models/event-read.server";
import { computeForInputs } from "~/models/event.server";
import { saveStation } from "~/models/apparatus.server";
import { saveProduct } from "~/models/product.server";
import { dataVersionsForRead } from "~/models/read-versions.server";
import { loader as eventsApiLoader } from "~/routes/api.events";
import { action as totalsAction } from "~/routes/api.totals";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { getRequest, jsonRequest, routeArgs } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeEvent, makeProduct, makeStation } from "../support/usage-fixtures";

// Answers kept in memory (list totals, /api/totals' catalogue facts) must equal what the
// straightforward queries give, and be recomputed after any write of the data they came from.
let officer: SessionUser;
let cookie: string;
let productId: number;

beforeAll(async () => {
  await ensureAgency(db);
  const made = await makeUser(["officer"], "Kept Answers Officer");
  officer = { id: made.id, email: made.email, name: made.name, roles: made.roles, stationId: null };
  cookie = await signIn(officer.email, TEST_PASSWORD);
  productId = (await makeProduct({ foamClass: "B" })).id;
  for (let day = 1; day <= 7; day += 1) {
    await makeEvent({
      createdBy: officer.id,
      startedAt: new Date(Date.UTC(2043, 1, day, 15)),
      discharges: [{ productId, percent: 3, water: 100 * day, concentrate: day }],
    });
  }
});

const QUERY = "from=2043-02-01&to=2043-02-28&size=3";
const page = async (number: number) =>
  (await (
    (await eventsApiLoader(
      routeArgs(getRequest(`/api/events?${QUERY}&page=${number}`, { Cookie: cookie })),
    )) as Response
  ).json()) as { count: number; totals: { water: { gal: number } }; items: { id: number }[] };

describe("GET /api/events with its totals kept per filter and data version", () => {
  it("gives every page the totals the filter's own query gives", async () => {
    const { filters } = parseEventFilters(new URLSearchParams(QUERY));
    const direct = await listTotals(officer, filters, "America/Chicago");
    expect(direct.count).toBe(7);
    for (const number of [1, 2, 3]) {
      const body = await page(number);
      expect(body.count).toBe(direct.count);
      expect(body.totals.water.gal).toBeCloseTo(direct.totals.water, 6);
    }
    expect((await page(3)).items).toHaveLength(1);
  });

  it("counts a report written after the totals were kept", async () => {
    const before = await page(1);
    const versionBefore = (await currentDataVersions(db)).reports;
    await makeEvent({
      createdBy: officer.id,
      startedAt: new Date(Date.UTC(2043, 1, 20, 15)),
      discharges: [{ productId, percent: 3, water: 1000, concentrate: 30 }],
    });
    expect((await currentDataVersions(db)).reports).not.toBe(versionBefore);
    const after = await page(1);
    expect(after.count).toBe(before.count + 1);
    expect(after.totals.water.gal).toBeCloseTo(before.totals.water.gal + 1000, 6);
  });
});

describe("GET /api/events with its page kept per person, filter and data versions", () => {
  const STATION_QUERY = "from=2044-03-01&to=2044-03-31&size=5";
  const stationPage = async () =>
    (await (
      (await eventsApiLoader(routeArgs(getRequest(`/api/events?${STATION_QUERY}`, { Cookie: cookie })))) as Response
    ).json()) as { items: { id: number; station: string | null; totals: { water: { gal: number } } }[] };

  it("shows a report written after the page was kept, and a station's new code", async () => {
    const { id: stationId } = await makeStation();
    const { id: first } = await makeEvent({
      createdBy: officer.id,
      stationId,
      startedAt: new Date(Date.UTC(2044, 2, 3, 15)),
      discharges: [{ productId, percent: 3, water: 250, concentrate: 7.5 }],
    });
    const kept = await stationPage();
    expect(kept.items.map((item) => item.id)).toEqual([first]);
    expect(await stationPage()).toEqual(kept);

    const { id: later } = await makeEvent({
      createdBy: officer.id,
      stationId,
      startedAt: new Date(Date.UTC(2044, 2, 9, 15)),
      discharges: [{ productId, percent: 3, water: 400, concentrate: 12 }],
    });
    const afterReport = await stationPage();
    expect(afterReport.items.map((item) => item.id)).toEqual([later, first]);
    expect(afterReport.items.map((item) => item.totals.water.gal)).toEqual([400, 250]);

    const station = await db("stations").where({ id: stationId }).first();
    await saveStation(
      stationId,
      Number(station.version),
      { code: `${station.code}R`, name: station.name, address: "", latitude: null, longitude: null, active: true },
      officer,
    );
    const afterRename = await stationPage();
    expect(afterRename.items.map((item) => item.station)).toEqual([`${station.code}R`, `${station.code}R`]);
  });
});

describe("POST /api/totals with the catalogue facts kept", () => {
  const lines = () => [
    { flow: 200, flowUnit: "gpm" as const, basis: "water" as const, percent: 3, minutes: 10, productId },
    { flow: 95, flowUnit: "gpm" as const, basis: "solution" as const, percent: 6, minutes: 4, productId },
  ];
  const post = async () =>
    (await (
      (await totalsAction(
        routeArgs(jsonRequest("/api/totals", { discharges: lines() }, { Cookie: cookie })),
      )) as Response
    ).json()) as { totals: { concentrate: { gal: number } }; discharges: { warnings: unknown[] }[] };

  it("answers what the save's own computation answers", async () => {
    const body = await post();
    const straight = await computeForInputs(
      lines().map((line) => ({ ...line, percentOf: line.basis === "water" ? "water" : "solution", apparatusId: null })),
    );
    expect(body.totals.concentrate.gal).toBeCloseTo(straight.totals.concentrate.gal, 2);
    expect(body.discharges.map((line) => line.warnings)).toEqual(straight.discharges.map((line) => line.warnings));
  });

  it("uses a product's new facts once the product is saved", async () => {
    const before = await post();
    const row = await db("foam_products").where({ id: productId }).first();
    const saved = await saveProduct(
      productId,
      Number(row.version),
      ProductFormSchema.parse({ name: row.name, foamClass: "A", foamType: "class-a", nominalPercents: "0.5" }),
      null,
      officer,
    );
    expect(saved).not.toBeNull();
    const after = await post();
    // A Class A product at 3 % and 6 % is outside the Class A range: the warnings change with the class.
    expect(after.discharges.map((line) => line.warnings)).not.toEqual(before.discharges.map((line) => line.warnings));
  });
});

describe("the data versions read with the session", () => {
  // Every statement the app sends through the one Knex instance, while `run` runs.
  const statementsDuring = async (run: () => Promise<unknown>) => {
    const statements: string[] = [];
    const record = (query: { sql: string }) => statements.push(query.sql);
    db.on("query", record);
    try {
      await run();
    } finally {
      db.off("query", record);
    }
    return statements;
  };

  it("spare a page of /api/events its own version query", async () => {
    const statements = await statementsDuring(() => page(1));
    expect(statements.filter((sql) => sql.includes("data_versions"))).toHaveLength(1);
    expect(statements.find((sql) => sql.includes("data_versions"))).toContain("`sessions`");
  });

  it("are the stamps a separate query reads", async () => {
    const request = getRequest(`/api/events?${QUERY}`, { Cookie: cookie });
    await eventsApiLoader(routeArgs(request));
    expect(await dataVersionsForRead(request)).toEqual(await currentDataVersions(db));
  });

  it("are read afresh for a request that brought no session", async () => {
    const statements = await statementsDuring(() => dataVersionsForRead(getRequest("/api/events")));
    expect(statements).toHaveLength(1);
    expect(statements[0]).toContain("data_versions");
  });
});
