// Foam systems: the migration of the apparatus's own proportioner figures, the accuracy-test
// computation API, recording maintenance and tests through the system page, the out-of-tolerance
// warning on usage lines, and the fleet API.
import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { computeForInputs } from "~/models/event.server";
import { saveFoamSystem } from "~/models/foam-system.server";
import { loader as fleetApi } from "~/routes/api.foam-systems";
import { action as computeApi } from "~/routes/api.foam-tests.compute";
import { action as systemAction, loader as systemLoader } from "~/routes/foam-systems.$systemId";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, jsonRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { privateDatabase } from "../support/test-database";
import { ensureAgency, makeProduct, makeStation } from "../support/usage-fixtures";
import { makeApparatusRow } from "../support/catalogue-factories";

const MIGRATION = "20261203140001_foam_systems.ts";

describe("the foam-systems migration", () => {
  const database = privateDatabase("systems_migration");
  const knex = database.knex;

  beforeAll(() => database.create());
  afterAll(() => database.drop());

  it("gives every apparatus with proportioner figures one system carrying them, its outlets and its lines", async () => {
    const [, pending] = (await knex.migrate.list()) as [unknown[], Array<{ file: string }>];
    // Every migration before this one (later ones, such as the stock tanks, build on its tables).
    for (const migration of pending) if (migration.file < MIGRATION) await knex.migrate.up({ name: migration.file });

    const [stationId] = await knex("stations").insert({ code: "M1", name: "Migration station" });
    const [withFigures] = await knex("apparatus").insert({
      station_id: stationId,
      unit_id: "M-E1",
      concentrate_tank_gal: 40,
      proportioner_max_concentrate_gpm: 2.5,
      proportioner_type: "direct_injection",
      water_flow_min_gpm: 10,
      water_flow_max_gpm: 250,
    });
    const [without] = await knex("apparatus").insert({ station_id: stationId, unit_id: "M-U2" });
    const [eductorUnit] = await knex("apparatus").insert({ unit_id: "M-E3", proportioner_type: "eductor" });
    await knex("apparatus_outlets").insert([
      { apparatus_id: withFigures, name: "Crosslay 1" },
      { apparatus_id: withFigures, name: "Deck gun" },
    ]);
    const [userId] = await knex("users").insert({ email: "m@test.example", name: "M", password_hash: "x" });
    const [productId] = await knex("foam_products").insert({
      name: "M Class A",
      foam_class: "A",
      foam_type: "class-a",
    });
    const [eventId] = await knex("events").insert({ number: "M-1", kind: "incident", created_by: userId });
    await knex("discharges").insert({
      event_id: eventId,
      position: 1,
      apparatus_id: withFigures,
      product_id: productId,
    });

    await knex.migrate.up({ name: MIGRATION });

    const systems = await knex("foam_systems").orderBy("apparatus_id");
    expect(systems).toHaveLength(2);
    const [first, eductor] = systems;
    expect(first).toMatchObject({ apparatus_id: withFigures, system_type: "direct_injection", percent_of: "water" });
    expect(Number(first.max_concentrate_gpm)).toBe(2.5);
    expect(Number(first.water_flow_min_gpm)).toBe(10);
    expect(Number(first.water_flow_max_gpm)).toBe(250);
    expect(eductor).toMatchObject({ apparatus_id: eductorUnit, system_type: "inline_eductor", percent_of: "solution" });
    expect(await knex("foam_systems").where({ apparatus_id: without })).toHaveLength(0);
    const tanks = await knex("foam_system_tanks").where({ foam_system_id: first.id });
    expect(tanks).toHaveLength(1);
    expect(Number(tanks[0].capacity_gal)).toBe(40);
    expect(tanks[0].product_id).toBe(productId);
    expect(
      (await knex("foam_system_outlets").where({ foam_system_id: first.id }).orderBy("outlet_name")).map(
        (row) => row.outlet_name,
      ),
    ).toEqual(["Crosslay 1", "Deck gun"]);
    expect((await knex("discharges").where({ event_id: eventId }).first()).foam_system_id).toBe(first.id);

    await knex.migrate.down({ name: MIGRATION });
    expect(await knex.schema.hasTable("foam_systems")).toBe(false);
    expect(await knex.schema.hasColumn("discharges", "foam_system_id")).toBe(false);
  });
});

describe("POST /api/foam-tests/compute", () => {
  let cookie: string;
  beforeAll(async () => {
    await ensureAgency();
    const officer = await makeUser(["officer"], "Officer Compute");
    cookie = await signIn(officer.email, TEST_PASSWORD);
  });

  async function compute(body: unknown) {
    const outcome = await settle(() =>
      computeApi(routeArgs(jsonRequest("/api/foam-tests/compute", body, { Cookie: cookie }))),
    );
    const response = outcome.value as Response;
    return { status: response.status, body: await response.json() };
  }

  it("answers exactly the achieved percentage, the fit, the band and pass", async () => {
    const { status, body } = await compute({
      method: "refractometer",
      foamClass: "B",
      ratedPercent: 3,
      calibration: [
        { percent: 0, reading: 1 },
        { percent: 1.5, reading: 4 },
        { percent: 3, reading: 7 },
        { percent: 6, reading: 13 },
      ],
      sampleReading: 8.6,
    });
    expect(status).toBe(200);
    expect(Object.keys(body).sort()).toEqual(["achievedPercent", "band", "intercept", "pass", "r2", "slope"]);
    // reading = 2 × percent + 1 exactly, so 8.6 reads as 3.8 %: inside 3.0–3.9.
    expect(body.slope).toBeCloseTo(2, 12);
    expect(body.intercept).toBeCloseTo(1, 12);
    expect(body.r2).toBeCloseTo(1, 12);
    expect(body.achievedPercent).toBeCloseTo(3.8, 12);
    expect(body.band).toEqual([3, 3.9]);
    expect(body.pass).toBe(true);
  });

  it("computes a flow test, with no fit", async () => {
    const { body } = await compute({
      method: "flow",
      foamClass: "B",
      ratedPercent: 6,
      concentrateGal: 7,
      waterGal: 93,
    });
    // 7 ÷ 100 × 100 is 7.000000000000001 in floating point: the band is checked on the figure kept.
    expect(body.achievedPercent).toBeCloseTo(7, 12);
    expect(body).toMatchObject({ slope: null, intercept: null, r2: null, band: [6, 7], pass: true });
  });

  it("answers 400 with field errors for one calibration point, equal readings and negatives", async () => {
    const single = await compute({
      method: "conductivity",
      foamClass: "B",
      ratedPercent: 3,
      calibration: [{ percent: 3, reading: 2 }],
      sampleReading: 2,
    });
    expect(single.status).toBe(400);
    expect(Object.keys(single.body.errors)).toContain("calibration");
    const equal = await compute({
      method: "conductivity",
      foamClass: "B",
      ratedPercent: 3,
      calibration: [
        { percent: 0, reading: 2 },
        { percent: 3, reading: 2 },
      ],
      sampleReading: 2,
    });
    expect(equal.status).toBe(400);
    expect(equal.body.errors.calibration[0]).toMatch(/equal/);
    const negative = await compute({
      method: "flow",
      foamClass: "B",
      ratedPercent: 3,
      concentrateGal: 3,
      waterGal: -97,
    });
    expect(negative.status).toBe(400);
    expect(Object.keys(negative.body.errors)).toEqual(["waterGal"]);
  });

  it("answers hostile or absurd readings with 400 and a message at each field, never a figure", async () => {
    // JSON.stringify cannot write Infinity: 1e999 is what a script would send, and JSON.parse reads it as Infinity.
    const raw = await settle(() =>
      computeApi(
        routeArgs(
          new Request("http://127.0.0.1:3000/api/foam-tests/compute", {
            method: "POST",
            body: '{"method":"flow","foamClass":"B","ratedPercent":3,"concentrateGal":1e999,"waterGal":97}',
            headers: { "Content-Type": "application/json", Cookie: cookie },
          }),
        ),
      ),
    );
    expect(raw.thrown).toBe(false);
    const infinite = raw.value as Response;
    expect(infinite.status).toBe(400);
    expect((await infinite.json()).errors).toEqual({
      concentrateGal: ["Enter the concentrate drawn (gal) as a number."],
    });

    const absurd = await compute({ method: "flow", foamClass: "A", ratedPercent: 99, concentrateGal: 0, waterGal: 97 });
    expect(absurd.status).toBe(400);
    expect(absurd.body.errors).toEqual({
      ratedPercent: ["The rated percent must be at most 10."],
      concentrateGal: ["The concentrate drawn (gal) must be more than 0."],
    });

    const curve = {
      method: "refractometer",
      foamClass: "B",
      ratedPercent: 3,
      calibration: [
        { percent: 0, reading: 1 },
        { percent: 3, reading: 7 },
      ],
    };
    const farOut = await compute({ ...curve, sampleReading: 999_999 });
    expect(farOut.status).toBe(400);
    expect(Object.keys(farOut.body.errors)).toEqual(["sampleReading"]);
    expect(farOut.body.errors.sampleReading[0]).toMatch(/more than 100 % of solution/);

    const flat = await compute({
      ...curve,
      calibration: [
        { percent: 0, reading: 1 },
        { percent: 1e-300, reading: 2 },
      ],
      sampleReading: 1.5,
    });
    expect(flat.status).toBe(400);
    expect(Object.keys(flat.body.errors)).toEqual(["calibration"]);

    const tooMany = await compute({
      ...curve,
      calibration: Array.from({ length: 21 }, (_, index) => ({ percent: index / 4, reading: 1 + index / 2 })),
      sampleReading: 2,
    });
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error).toMatch(/calibration has more than 20 entries/);
  });
});

describe("a system's records, its tolerance and the fleet", () => {
  let officerCookie: string;
  let officer: Awaited<ReturnType<typeof makeUser>>;
  let systemId: number;
  let apparatusId: number;
  let productId: number;

  beforeAll(async () => {
    await ensureAgency();
    const station = await makeStation();
    officer = await makeUser(["officer"], "Officer Systems", { stationId: station.id });
    officerCookie = await signIn(officer.email, TEST_PASSWORD);
    const chief = await makeUser(["chief"], "Chief Systems");
    productId = (await makeProduct({ foamClass: "B" })).id;
    apparatusId = (
      await makeApparatusRow({
        stationId: station.id,
        outlets: [{ name: "Bumper line", foamCapable: true, defaultFlowGpm: 95, defaultFlowBasis: "solution" }],
      })
    ).id;
    const saved = await saveFoamSystem(
      apparatusId,
      null,
      null,
      {
        name: "Class B around-the-pump",
        systemType: "around_the_pump",
        percentOf: "solution",
        maxConcentrateGpm: 6,
        outlets: "Bumper line",
        tankName: "Tank B",
        tankCapacityGal: 20,
        tankProductId: productId,
      },
      { id: chief.id, email: chief.email, name: chief.name, roles: ["chief"], stationId: null, epoch: 0 } as never,
    );
    if ("kind" in saved) throw new Error(saved.message);
    systemId = saved.id;
  });

  const post = (fields: Record<string, string>) =>
    settle(() =>
      systemAction(
        routeArgs(formRequest(`/foam-systems/${systemId}`, fields, { Cookie: officerCookie }), {
          systemId: String(systemId),
        }),
      ),
    );
  const statusOf = (value: unknown) =>
    value instanceof Response ? value.status : ((value as { init?: { status?: number } }).init?.status ?? 200);
  const errorsOf = (value: unknown) =>
    (value as { data: { result: { error: Record<string, string[]> } } }).data.result.error;

  const refractometerTest = (testedAt: string, sampleReading: string) => ({
    intent: "test",
    testedAt,
    method: "refractometer",
    foamClass: "B",
    productId: String(productId),
    ratedPercent: "3",
    "calibration[0].percent": "0",
    "calibration[0].reading": "1",
    "calibration[1].percent": "1.5",
    "calibration[1].reading": "4",
    "calibration[2].percent": "3",
    "calibration[2].reading": "7",
    "calibration[3].percent": "6",
    "calibration[3].reading": "13",
    sampleReading,
  });

  async function warningsOn(startedAt: Date) {
    const usage = await computeForInputs([
      {
        flow: 95,
        flowUnit: "gpm",
        basis: "solution",
        percent: 3,
        minutes: 5,
        productId,
        apparatusId,
        outlet: "Bumper line",
        startedAt,
      },
    ]);
    return usage.discharges[0];
  }

  it("asks for the usage report of a flush that flowed, and records one that names it", async () => {
    const refused = await post({
      intent: "maintenance",
      kind: "flush",
      flushReason: "after_use",
      performedAt: "2026-03-02T10:00",
      waterGal: "40",
    });
    expect(statusOf(refused.value)).toBe(400);
    expect(errorsOf(refused.value).eventNumber?.[0]).toMatch(/usage report/);

    const number = `FL-${randomUUID().slice(0, 6)}`;
    await db("events").insert({ number, kind: "flush", created_by: officer.id });
    const saved = await post({
      intent: "maintenance",
      kind: "flush",
      flushReason: "after_use",
      performedAt: "2026-03-02T10:00",
      waterGal: "40",
      eventNumber: number,
    });
    expect(statusOf(saved.value)).toBe(302);
    const row = await db("foam_system_maintenance").where({ foam_system_id: systemId }).first();
    expect(row.kind).toBe("flush");
    expect(row.event_id).not.toBeNull();
  });

  it("refuses a PFAS changeover without its rinse procedure", async () => {
    const legacy = await makeProduct({ foamClass: "B", foamType: "ar-afff", pfasContaining: true });
    const refused = await post({
      intent: "maintenance",
      kind: "changeover",
      performedAt: "2026-03-03T10:00",
      fromProductId: String(legacy.id),
      toProductId: String(productId),
    });
    expect(statusOf(refused.value)).toBe(400);
    expect(errorsOf(refused.value).rinseProcedure?.[0]).toMatch(/PFAS/);
  });

  it("a failing test puts the system out of tolerance, warns its lines, and a passing retest clears it", async () => {
    // 9.2 reads as 4.1 % on the line 2x + 1: above 3.9 %.
    const failed = await post(refractometerTest("2026-03-10T09:00", "9.2"));
    expect(statusOf(failed.value)).toBe(302);
    const system = await db("foam_systems").where({ id: systemId }).first();
    expect(system.status).toBe("out_of_tolerance");
    expect(system.status_reason).toMatch(/4\.1 %/);

    const during = await warningsOn(new Date("2026-03-12T15:00:00Z"));
    expect(during.foamSystemId).toBe(systemId);
    expect(during.warnings.map((warning) => warning.code)).toContain("system_out_of_tolerance");

    const fleet = await fleetApi(routeArgs(getRequest("/api/foam-systems", { Cookie: officerCookie })));
    const items = ((await fleet.json()) as { items: Array<Record<string, unknown>> }).items;
    const mine = items.find((item) => item.id === systemId)!;
    expect(Object.keys(mine).sort()).toEqual(
      [
        "apparatus",
        "id",
        "lastFlushAt",
        "lastTestAt",
        "lastTestPass",
        "nextTestDue",
        "percentOf",
        "status",
        "type",
      ].sort(),
    );
    expect(mine).toMatchObject({ status: "out_of_tolerance", lastTestPass: false, type: "around_the_pump" });
    expect(items[0].status).toBe("out_of_tolerance");

    const passed = await post(refractometerTest("2026-03-20T09:00", "7.4"));
    expect(statusOf(passed.value)).toBe(302);
    expect((await db("foam_systems").where({ id: systemId }).first()).status).toBe("in_service");
    expect((await warningsOn(new Date("2026-03-21T15:00:00Z"))).warnings.map((w) => w.code)).not.toContain(
      "system_out_of_tolerance",
    );
    // A line flowed between the failure and the retest keeps its warning when it is saved later.
    expect((await warningsOn(new Date("2026-03-12T15:00:00Z"))).warnings.map((w) => w.code)).toContain(
      "system_out_of_tolerance",
    );

    const page = (await systemLoader(
      routeArgs(getRequest(`/foam-systems/${systemId}`, { Cookie: officerCookie }), { systemId: String(systemId) }),
    )) as { system: { tests: Array<{ pass: boolean }>; nextTestDue: string } };
    expect(page.system.tests.map((test) => test.pass)).toEqual([true, false]);
    expect(page.system.nextTestDue).toBe("2027-03-20");
  });

  it("refuses a test with a single calibration mix at its field, keeping the typing", async () => {
    const outcome = await post({
      intent: "test",
      testedAt: "2026-03-21T09:00",
      method: "conductivity",
      foamClass: "B",
      ratedPercent: "3",
      "calibration[0].percent": "3",
      "calibration[0].reading": "7",
      sampleReading: "7",
    });
    expect(statusOf(outcome.value)).toBe(400);
    expect(errorsOf(outcome.value).calibration?.[0]).toMatch(/at least two/);
  });

  it("refuses a recorded test whose sample reads back past 100 % of solution, writing nothing", async () => {
    const before = await db("foam_accuracy_tests").where({ foam_system_id: systemId }).count({ n: "*" });
    const outcome = await post(refractometerTest("2026-03-22T09:00", "999"));
    expect(statusOf(outcome.value)).toBe(400);
    expect(errorsOf(outcome.value).sampleReading?.[0]).toMatch(/more than 100 % of solution/);
    expect(await db("foam_accuracy_tests").where({ foam_system_id: systemId }).count({ n: "*" })).toEqual(before);
  });
});
