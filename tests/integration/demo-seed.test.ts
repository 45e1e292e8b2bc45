import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { computeUsage, type DischargeInput } from "~/lib/foam/totals";
import { loadCatalogueFacts } from "~/models/usage-builders.server";
import { privateDatabase } from "../support/test-database";
import { eventReportableQuantity } from "~/models/environmental-report.server";

// The demo seed runs into a database of its own, so the other tests' rows cannot disturb it.
const demo = privateDatabase("seed");
const knex = demo.knex;

const SEEDS = ["01_agency_and_accounts.ts", "02_catalogue.ts", "03_events.ts"];

beforeAll(() => demo.seed(SEEDS), 120_000);
afterAll(() => demo.drop());

const number = (value: unknown) => (value == null ? null : Number(value));
// Stored volumes are DECIMAL(16,6): equal to the computation within the last stored place.
const STORED_PLACES = 1e-6;

describe("the demo seed", () => {
  it("stores, for every discharge and event, exactly what the usage arithmetic computes", async () => {
    const facts = await loadCatalogueFacts(knex);
    const events = await knex("events").orderBy("id");
    const discharges = await knex("discharges").orderBy(["event_id", "position"]);
    const readings = await knex("tank_readings");
    expect(events.length).toBeGreaterThanOrEqual(60);
    for (const event of events) {
      const lines = discharges.filter((line) => line.event_id === event.id);
      expect(lines.length, event.number).toBeGreaterThan(0);
      const inputs: DischargeInput[] = lines.map((line) => ({
        flow: Number(line.flow),
        flowUnit: line.flow_unit,
        basis: line.flow_basis,
        percent: number(line.percent),
        minutes: Number(line.minutes),
        productId: line.product_id,
        apparatusId: line.apparatus_id,
        startedAt: line.started_at,
        endedAt: line.ended_at,
      }));
      const usage = computeUsage(inputs, {
        products: facts.products,
        apparatus: facts.apparatus,
        eventWindow: { start: event.started_at, end: event.cleared_at },
        tankReadings: readings
          .filter((reading) => reading.event_id === event.id)
          .map((reading) => ({
            apparatusId: reading.apparatus_id,
            productId: reading.product_id,
            refillGal: number(reading.refill_gal),
            levelBeforeGal: number(reading.level_before_gal),
            levelAfterGal: number(reading.level_after_gal),
          })),
        drawdownTolerance: facts.drawdownTolerance,
      });
      lines.forEach((line, index) => {
        const result = usage.discharges[index];
        expect(Number(line.water_gal)).toBeCloseTo(result.water.gal, 5);
        expect(Number(line.concentrate_gal)).toBeCloseTo(result.concentrate.gal, 5);
        expect(Number(line.solution_gal)).toBeCloseTo(result.solution.gal, 5);
        if (result.effectivePercent == null) expect(line.effective_percent).toBeNull();
        else expect(Math.abs(Number(line.effective_percent) - result.effectivePercent)).toBeLessThan(1e-4);
        expect(JSON.parse(line.warnings)).toEqual(result.warnings);
      });
      expect(Math.abs(Number(event.water_gal) - usage.totals.water.gal)).toBeLessThan(STORED_PLACES);
      expect(Math.abs(Number(event.concentrate_gal) - usage.totals.concentrate.gal)).toBeLessThan(STORED_PLACES);
      expect(Math.abs(Number(event.solution_gal) - usage.totals.solution.gal)).toBeLessThan(STORED_PLACES);
      expect(Boolean(event.pfas_containing), event.number).toBe(usage.pfasContaining);
      const warned = usage.eventWarnings.length > 0 || usage.discharges.some((result) => result.warnings.length > 0);
      expect(Boolean(event.has_warnings), event.number).toBe(warned);
      expect(JSON.parse(event.event_warnings), event.number).toEqual(usage.eventWarnings);
    }
  });

  it("gives every event runoff dispositions: shares that add up to 100 %, or volumes within the solution made", async () => {
    const events = await knex("events").select("id", "number", "solution_gal");
    const dispositions = await knex("runoff_dispositions");
    for (const event of events) {
      const rows = dispositions.filter((row) => row.event_id === event.id);
      expect(rows.length, event.number).toBeGreaterThan(0);
      const shares = rows.filter((row) => row.share_percent != null);
      if (shares.length) {
        expect(shares.length, event.number).toBe(rows.length);
        expect(
          shares.reduce((sum, row) => sum + Number(row.share_percent), 0),
          event.number,
        ).toBeCloseTo(100, 6);
      } else {
        const volume = rows.reduce((sum, row) => sum + Number(row.volume_gal), 0);
        expect(volume, event.number).toBeLessThanOrEqual(Number(event.solution_gal) + 1e-6);
      }
      for (const row of rows) {
        if (row.disposition === "sanitary_sewer") expect(row.sewer_notice, event.number).not.toBe("");
      }
    }
  });

  it("records who started, filed and reviewed each report in the audit log, in order", async () => {
    const events = await knex("events").select("id", "number", "status");
    const audits = await knex("audit_events").where({ entity_type: "event" }).orderBy("id");
    const expected = { draft: ["report_created"], filed: ["report_created", "report_filed"] } as Record<
      string,
      string[]
    >;
    expected.accepted = [...expected.filed, "report_accepted"];
    expected.returned = [...expected.filed, "report_returned"];
    for (const event of events) {
      const actions = audits.filter((row) => row.entity_id === String(event.id)).map((row) => row.action);
      expect(actions, event.number).toEqual(expected[event.status]);
    }
    expect(audits.every((row) => row.actor_label === "demo seed")).toBe(true);
  });

  it("shows a recorded notification and an Unknown PFAS answer (the legacy product has no PFOA/PFOS content)", async () => {
    await knex.seed.run({ specific: "07_release_notifications.ts" });
    const [notification] = await knex("release_notifications");
    expect(notification).toMatchObject({ party: "state_spill_line", case_number: "DEMO-SPILL-0001" });
    const legacy = await knex("foam_products").where({ pfas_containing: true }).first();
    expect(legacy.pfoa_content).toBeNull();
    expect(legacy.pfos_content).toBeNull();
    const event = await knex("events").where({ id: notification.event_id }).first();
    expect(Boolean(event.pfas_containing)).toBe(true);
    // The event page's answer, per substance, by the mixture rule (40 CFR 302.6(b)(1)(ii)): never "No".
    expect(await eventReportableQuantity(event.id, 1, knex)).toMatchObject({ pfoa: "unknown", pfos: "unknown" });
    const plain = await knex("events").where({ pfas_containing: false }).whereNot({ status: "draft" }).first();
    expect(await eventReportableQuantity(plain.id, 1, knex)).toBeNull();
  });

  it("covers every kind and status, the cases the reports must show, inside the district", async () => {
    const events = await knex("events");
    expect(new Set(events.map((event) => event.kind))).toEqual(new Set(["incident", "training", "test", "flush"]));
    expect(new Set(events.map((event) => event.status))).toEqual(new Set(["draft", "filed", "returned", "accepted"]));
    const started = events.map((event) => event.started_at.getTime());
    expect(Math.min(...started)).toBeGreaterThanOrEqual(Date.UTC(2025, 11, 1));
    expect(Math.max(...started)).toBeLessThan(Date.UTC(2026, 11, 1));
    for (const event of events) {
      const [lat, lon] = [Number(event.latitude), Number(event.longitude)];
      expect(lat, event.number).toBeGreaterThanOrEqual(38.6);
      expect(lat, event.number).toBeLessThanOrEqual(38.8);
      expect(lon, event.number).toBeGreaterThanOrEqual(-98.32);
      expect(lon, event.number).toBeLessThanOrEqual(-98.08);
      expect(event.drainage_basin).toBeNull();
      expect(event.cleared_at.getTime()).toBeGreaterThan(event.started_at.getTime());
    }
    const reviewer = await knex("users").where({ email: "enviro@alderbend.example" }).first();
    const authors = await knex("users")
      .whereIn("email", ["officer@alderbend.example", "officer2@alderbend.example"])
      .pluck("id");
    for (const event of events) {
      expect(authors).toContain(event.created_by);
      if (event.status === "accepted" || event.status === "returned") expect(event.reviewed_by).toBe(reviewer.id);
      if (event.status === "draft") expect(event.filed_at).toBeNull();
      if (event.status === "returned") expect(event.review_comment).toBeTruthy();
    }
    // A legacy PFAS foam release reaching a storm drain.
    const legacy = await knex("events")
      .join("runoff_dispositions", "runoff_dispositions.event_id", "events.id")
      .where({ "events.pfas_containing": true, "runoff_dispositions.disposition": "storm_drain" })
      .first("events.number");
    expect(legacy).toBeDefined();
    // A contained Class B spill with a disposal record.
    const contained = await knex("events")
      .join("runoff_dispositions", "runoff_dispositions.event_id", "events.id")
      .join("discharges", "discharges.event_id", "events.id")
      .join("foam_products", "foam_products.id", "discharges.product_id")
      .where({ "runoff_dispositions.disposition": "contained", "foam_products.foam_class": "B" })
      .whereNot("runoff_dispositions.disposal_reference", "")
      .first("events.number");
    expect(contained).toBeDefined();
    expect(await knex("runoff_dispositions").where({ disposition: "sanitary_sewer" }).first()).toBeDefined();
    expect(Number((await knex("tank_readings").count({ n: "*" }).first())!.n)).toBeGreaterThan(5);
  });

  it("seeds the stations the map uses and labels the invented products as demo data", async () => {
    const stations = await knex("stations").orderBy("code");
    expect(stations.map((row) => [row.code, Number(row.latitude), Number(row.longitude)])).toEqual([
      ["S1", 38.7, -98.2],
      ["S2", 38.735, -98.15],
      ["S3", 38.655, -98.245],
    ]);
    const products = await knex("foam_products");
    expect(products).toHaveLength(3);
    for (const product of products) expect(product.name).toMatch(/\(demo/);
    const legacy = products.find((product) => product.pfas_containing);
    expect(legacy).toMatchObject({ foam_type: "ar-afff", nominal_percents: "3,6", pfas_content_unit: "g_per_l" });
    expect(legacy.pfas_content_basis).toMatch(/estimate/i);
    const cafs = await knex("apparatus").whereNotNull("compressed_air_cfm");
    expect(cafs).toHaveLength(2);
  });

  it("adds nothing when run again", async () => {
    const counts = async () =>
      Promise.all(
        ["events", "discharges", "stations", "apparatus", "foam_products"].map(async (table) =>
          Number((await knex(table).count({ n: "*" }).first())!.n),
        ),
      );
    const before = await counts();
    for (const file of SEEDS) await knex.seed.run({ specific: file });
    expect(await counts()).toEqual(before);
  });
});
