import { randomUUID } from "node:crypto";
import { readFileSync } from "node:fs";
import { gunzipSync } from "node:zlib";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import type { LayerKind } from "~/lib/geo/layers";
import { bumpDataVersion } from "~/models/data-version.server";
import { recomputeEventGeography, replaceLayer } from "~/models/geography.server";
import { refreshFoamClassTotals } from "~/models/report-rows.server";
import { loader as checkLoader } from "~/routes/api.geo.check";
import { loader as addressLoader } from "~/routes/api.geo.addresses";
import { loader as layerLoader } from "~/routes/api.geo.layers";
import { loader as eventsLoader } from "~/routes/api.map.events";
import { loader as summaryLoader } from "~/routes/api.summary";
import { action as geographyAction } from "~/routes/geography";
import { loader as tileLoader } from "~/routes/tiles";
import { makeUser } from "../support/factories";
import { startFileStore } from "../support/file-store";
import { getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";

const ORIGIN = "http://127.0.0.1:3000";
const DEMO_FILES: Record<LayerKind, string> = {
  drainage_basins: "drainage-basins.geojson",
  waterways: "waterways.geojson",
  storm_inlets: "storm-inlets.geojson",
  jurisdiction: "jurisdiction.geojson",
  address_points: "address-points.geojson",
};
const demoText = (kind: LayerKind) => readFileSync(`tiles/sources/alder-bend/${DEMO_FILES[kind]}`, "utf8");

let officer: string;
let chief: string;
let environmental: string;
const ids: Record<"atStation" | "onPond" | "draft" | "nearMillrace", number> = {
  atStation: 0,
  onPond: 0,
  draft: 0,
  nearMillrace: 0,
};

async function json(response: unknown) {
  expect(response).toBeInstanceOf(Response);
  return (response as Response).json();
}

async function status(run: () => Promise<unknown>): Promise<number> {
  const outcome = await settle(run);
  const value = outcome.value as { status?: number; init?: { status?: number } };
  return value instanceof Response ? value.status : (value.init?.status ?? 200);
}

let closeFileStore: () => Promise<void>;

beforeAll(async () => {
  closeFileStore = await startFileStore("geography");
  for (const kind of Object.keys(DEMO_FILES) as LayerKind[]) {
    if (await db("geo_layers").where({ kind }).first("id")) continue;
    const result = await replaceLayer({ kind, text: demoText(kind), fileName: DEMO_FILES[kind] }, null, null, {
      recheckEvents: false,
      keepFile: false,
    });
    expect(result.ok).toBe(true);
  }
  const people = {
    officer: await makeUser(["officer"]),
    chief: await makeUser(["chief"]),
    environmental: await makeUser(["environmental"]),
  };
  officer = await signIn(people.officer.email, people.officer.password, "10.9.0.1");
  chief = await signIn(people.chief.email, people.chief.password, "10.9.0.2");
  environmental = await signIn(people.environmental.email, people.environmental.password, "10.9.0.3");

  const suffix = randomUUID().slice(0, 8);
  const [classA] = await db("foam_products").insert({
    name: `Map test Class A ${suffix}`,
    foam_class: "A",
    foam_type: "class-a",
  });
  const [legacyB] = await db("foam_products").insert({
    name: `Map test AR-AFFF ${suffix}`,
    foam_class: "B",
    foam_type: "ar-afff",
    pfas_containing: true,
  });
  // Invented events in March–April 2019, a period no other test uses.
  const event = async (
    key: keyof typeof ids,
    fields: { latitude: number; longitude: number; started: string; status: string; kind: string; pfas?: boolean },
    discharge: { product: number; concentrate: number; water: number },
  ) => {
    const [id] = await db("events").insert({
      number: `MAP-${suffix}-${key}`,
      kind: fields.kind,
      status: fields.status,
      started_at: new Date(fields.started),
      latitude: fields.latitude,
      longitude: fields.longitude,
      created_by: people.officer.id,
      water_gal: discharge.water,
      concentrate_gal: discharge.concentrate,
      solution_gal: discharge.water + discharge.concentrate,
      pfas_containing: fields.pfas ?? false,
    });
    await db("discharges").insert({
      event_id: id,
      position: 1,
      product_id: discharge.product,
      water_gal: discharge.water,
      concentrate_gal: discharge.concentrate,
      solution_gal: discharge.water + discharge.concentrate,
    });
    await refreshFoamClassTotals(db, [id]);
    ids[key] = id;
  };
  await event(
    "atStation",
    { latitude: 38.7, longitude: -98.2, started: "2019-03-10T15:00:00Z", status: "filed", kind: "incident" },
    { product: classA, concentrate: 2, water: 598 },
  );
  await event(
    "onPond",
    {
      latitude: 38.724,
      longitude: -98.236,
      started: "2019-03-20T18:00:00Z",
      status: "accepted",
      kind: "training",
      pfas: true,
    },
    { product: legacyB, concentrate: 5, water: 161.667 },
  );
  await event(
    "draft",
    { latitude: 38.75, longitude: -98.15, started: "2019-03-15T12:00:00Z", status: "draft", kind: "incident" },
    { product: classA, concentrate: 9, water: 100 },
  );
  await event(
    "nearMillrace",
    { latitude: 38.735, longitude: -98.15, started: "2019-04-02T16:00:00Z", status: "accepted", kind: "test" },
    { product: classA, concentrate: 1, water: 332.333 },
  );
  await db("runoff_dispositions").insert({ event_id: ids.onPond, disposition: "surface_water", volume_gal: 100 });
  await db("runoff_dispositions").insert({ event_id: ids.atStation, disposition: "soil", share_percent: 50 });
  for (const id of Object.values(ids)) await recomputeEventGeography(id);
});

afterAll(async () => {
  // Put the demo basins back for the test files that run after this one.
  await replaceLayer({ kind: "drainage_basins", text: demoText("drainage_basins"), fileName: "restore" }, null);
  await closeFileStore();
});

const PERIOD = "from=2019-03-01&to=2019-04-30";

describe("stored geography checks", () => {
  it("recomputeEventGeography stores basin, nearest water and inlet, buffer and boundary", async () => {
    const row = await db("events").where({ id: ids.atStation }).first();
    expect(row.drainage_basin).toBe("South Fork");
    expect(row.nearest_waterway).toBe("Alder Creek");
    expect(Number(row.nearest_waterway_m)).toBeGreaterThan(200);
    expect(Number(row.nearest_waterway_m)).toBeLessThan(225);
    expect(row.nearest_inlet).toMatch(/^Inlet AB-/);
    expect(Boolean(row.within_waterway_buffer)).toBe(false);
    expect(Boolean(row.outside_jurisdiction)).toBe(false);
    expect(row.geo_checked_at).not.toBeNull();

    const pond = await db("events").where({ id: ids.onPond }).first();
    expect(pond.nearest_waterway).toBe("Heron Pond");
    expect(Number(pond.nearest_waterway_m)).toBe(0);
    expect(Boolean(pond.within_waterway_buffer)).toBe(true);
  });

  it("an event without a location gets empty checks, and a missing event gives null", async () => {
    await db("events").where({ id: ids.draft }).update({ latitude: null, longitude: null });
    const checks = await recomputeEventGeography(ids.draft);
    expect(checks?.drainageBasin).toBeNull();
    expect((await db("events").where({ id: ids.draft }).first()).drainage_basin).toBeNull();
    expect(await recomputeEventGeography(999_999_999)).toBeNull();
    await db("events").where({ id: ids.draft }).update({ latitude: 38.75, longitude: -98.15 });
  });
});

describe("GET /api/geo/check and /api/geo/addresses", () => {
  it("answers an officer with the checks for a point", async () => {
    const body = await json(
      await checkLoader(routeArgs(getRequest("/api/geo/check?lat=38.7&lon=-98.2", { Cookie: officer }))),
    );
    expect(body).toMatchObject({ drainageBasin: "South Fork", nearestWaterway: "Alder Creek", waterwayBufferM: 91.44 });
    expect(body.layersMissing).toEqual([]);
  });

  it("refuses a bad coordinate with 400 and a field message, and a stranger with 401", async () => {
    const bad = await settle(() =>
      checkLoader(routeArgs(getRequest("/api/geo/check?lat=abc&lon=-98.2", { Cookie: officer }))),
    );
    expect((bad.value as Response).status).toBe(400);
    expect((await (bad.value as Response).json()).errors.lat[0]).toMatch(/latitude/);
    // Hex, exponents and a missing coordinate are not decimal degrees either.
    for (const [query, field] of [
      ["lat=0x10&lon=-98.2", "lat"],
      ["lat=38.7&lon=-9.82e1", "lon"],
      ["lat=38.7", "lon"],
    ]) {
      const refused = await settle(() =>
        checkLoader(routeArgs(getRequest(`/api/geo/check?${query}`, { Cookie: officer }))),
      );
      expect((refused.value as Response).status).toBe(400);
      expect(Object.keys((await (refused.value as Response).json()).errors)).toEqual([field]);
    }
    expect(await status(() => checkLoader(routeArgs(getRequest("/api/geo/check?lat=38.7&lon=-98.2"))))).toBe(401);
  });

  it("finds the district's address points", async () => {
    const body = await json(
      await addressLoader(routeArgs(getRequest("/api/geo/addresses?q=105%20main", { Cookie: officer }))),
    );
    expect(body.matches[0].address).toBe("105 Main Street");
  });
});

describe("GET /api/map/events.geojson", () => {
  const load = (query: string, cookie = chief) =>
    eventsLoader(routeArgs(getRequest(`/api/map/events.geojson?${query}`, { Cookie: cookie })));

  it("returns filed, returned and accepted events as an RFC 7946 FeatureCollection with totals", async () => {
    const response = (await load(PERIOD)) as Response;
    expect(response.headers.get("Content-Type")).toMatch(/application\/geo\+json/);
    const body = await response.json();
    expect(body.type).toBe("FeatureCollection");
    const byId = new Map(body.features.map((f: { properties: { id: number } }) => [f.properties.id, f]));
    expect(byId.has(ids.draft)).toBe(false);
    const pond = byId.get(ids.onPond) as { geometry: unknown; properties: Record<string, unknown> };
    expect(pond.geometry).toEqual({ type: "Point", coordinates: [-98.236, 38.724] });
    expect(pond.properties).toMatchObject({
      foamClass: "B",
      pfasContaining: true,
      concentrateGal: 5,
      classBConcentrateGal: 5,
      nearestWaterway: "Heron Pond",
      withinWaterwayBuffer: true,
    });
    // The id once: no feature-level id and no url beside it (the map links to /events/:id).
    expect(Object.keys(pond)).toEqual(["type", "geometry", "properties"]);
    expect(pond.properties).not.toHaveProperty("url");
    expect(body.features).toHaveLength(3);
  });

  it("carries everything the map's points, popups and list of events in view read", async () => {
    const body = await ((await load(PERIOD)) as Response).json();
    for (const feature of body.features) {
      expect(Object.keys(feature.properties).sort()).toEqual(
        [
          "address",
          "classAConcentrateGal",
          "classBConcentrateGal",
          "concentrateGal",
          "drainageBasin",
          "foamClass",
          "id",
          "kind",
          "nearestWaterway",
          "nearestWaterwayM",
          "number",
          "pfasContaining",
          "solutionGal",
          "startedAt",
          "station",
          "status",
          "waterGal",
          "withinWaterwayBuffer",
        ].sort(),
      );
      expect(new Date(feature.properties.startedAt).toISOString().replace(".000Z", "Z")).toBe(
        feature.properties.startedAt,
      );
      for (const coordinate of feature.geometry.coordinates) {
        expect(Math.round(coordinate * 1e5) / 1e5).toBe(coordinate);
      }
      if (feature.properties.nearestWaterwayM !== null) {
        expect(Number.isInteger(feature.properties.nearestWaterwayM)).toBe(true);
      }
    }
  });

  it("sends the same events gzipped on request, and 304 for the tag it gave until a report changes", async () => {
    const plain = (await load(PERIOD)) as Response;
    const etag = plain.headers.get("ETag");
    expect(etag).toMatch(/^".+"$/);
    const plainText = await plain.text();
    const zipped = (await eventsLoader(
      routeArgs(getRequest(`/api/map/events.geojson?${PERIOD}`, { Cookie: chief, "Accept-Encoding": "gzip, br" })),
    )) as Response;
    expect(zipped.headers.get("Content-Encoding")).toBe("gzip");
    expect(gunzipSync(Buffer.from(await zipped.arrayBuffer())).toString("utf8")).toBe(plainText);

    const again = (await eventsLoader(
      routeArgs(getRequest(`/api/map/events.geojson?${PERIOD}`, { Cookie: chief, "If-None-Match": etag! })),
    )) as Response;
    expect(again.status).toBe(304);
    expect(await again.text()).toBe("");
    // Another filter is another answer with its own tag.
    const other = (await load(`${PERIOD}&class=B`)) as Response;
    expect(other.headers.get("ETag")).not.toBe(etag);

    // A report's write gives the data a new version: the old tag no longer matches, and the answer is fresh.
    await bumpDataVersion(db, "reports");
    const afterWrite = (await eventsLoader(
      routeArgs(getRequest(`/api/map/events.geojson?${PERIOD}`, { Cookie: chief, "If-None-Match": etag! })),
    )) as Response;
    expect(afterWrite.status).toBe(200);
    expect(afterWrite.headers.get("ETag")).not.toBe(etag);
    expect(await afterWrite.text()).toBe(plainText);
  });

  it("sends an event's new address after its report changes, the rest of the body as it was", async () => {
    const before = await ((await load(PERIOD)) as Response).text();
    const row = await db("events").where({ id: ids.onPond }).first("address");
    try {
      await db("events").where({ id: ids.onPond }).update({ address: "1 Changed Lane, Alder Bend (demo)" });
      await bumpDataVersion(db, "reports");
      const after = await ((await load(PERIOD)) as Response).text();
      const expected = JSON.parse(before) as { features: { properties: { id: number; address: string } }[] };
      for (const feature of expected.features) {
        if (feature.properties.id === ids.onPond) feature.properties.address = "1 Changed Lane, Alder Bend (demo)";
      }
      expect(after).toBe(JSON.stringify(expected));
    } finally {
      await db("events").where({ id: ids.onPond }).update({ address: row.address });
      await bumpDataVersion(db, "reports");
    }
  });

  it("filters by foam class, kind and bounding box", async () => {
    const ofQuery = async (query: string) =>
      (
        (await ((await load(`${PERIOD}&${query}`)) as Response).json()).features as { properties: { id: number } }[]
      ).map((f) => f.properties.id);
    expect(await ofQuery("class=B")).toEqual([ids.onPond]);
    expect(await ofQuery("kind=test")).toEqual([ids.nearMillrace]);
    expect(await ofQuery("bbox=-98.16,38.73,-98.14,38.74")).toEqual([ids.nearMillrace]);
  });

  it("refuses a bad bbox or date with 400, and an officer with 403", async () => {
    expect(await status(() => load(`${PERIOD}&bbox=1,2,3`))).toBe(400);
    expect(await status(() => load("from=2019-02-30&to=2019-03-01"))).toBe(400);
    expect(await status(() => load(PERIOD, officer))).toBe(403);
  });
});

describe("GET /api/summary", () => {
  it("totals what matches by foam class, product, disposition, basin and month", async () => {
    const body = await json(await summaryLoader(routeArgs(getRequest(`/api/summary?${PERIOD}`, { Cookie: chief }))));
    expect(body.totals).toMatchObject({ events: 3, concentrateGal: 8, pfasEvents: 1, pfasConcentrateGal: 5 });
    expect(body.byFoamClass).toEqual([
      { foamClass: "A", concentrateGal: 3, solutionGal: 933.333, events: 2 },
      { foamClass: "B", concentrateGal: 5, solutionGal: 166.667, events: 1 },
    ]);
    // The soil share is 50 % of 600 gal of solution; the pond release was given as 100 gal.
    expect(body.byDisposition).toEqual([
      { disposition: "soil", solutionGal: 300, events: 1 },
      { disposition: "surface_water", solutionGal: 100, events: 1 },
    ]);
    // Heron Pond (demo) lies just south of the Upper Alder divide, in South Fork.
    expect(
      body.byDrainageBasin.map((row: { drainageBasin: string; events: number; concentrateGal: number }) => [
        row.drainageBasin,
        row.events,
        row.concentrateGal,
      ]),
    ).toEqual([
      ["Millrace", 1, 1],
      ["South Fork", 2, 7],
    ]);
    expect(body.byMonth).toEqual([
      { month: "2019-03", classAConcentrateGal: 2, classBConcentrateGal: 5 },
      { month: "2019-04", classAConcentrateGal: 1, classBConcentrateGal: 0 },
    ]);
  });

  it("counts only what is inside the bbox", async () => {
    const body = await json(
      await summaryLoader(
        routeArgs(getRequest(`/api/summary?${PERIOD}&bbox=-98.21,38.69,-98.19,38.71`, { Cookie: chief })),
      ),
    );
    expect(body.totals).toMatchObject({ events: 1, concentrateGal: 2 });
  });
});

describe("uploading a layer on /geography", () => {
  function upload(kind: string, text: string, cookie = environmental, fileName = "upload.geojson") {
    const form = new FormData();
    form.set("kind", kind);
    form.set("file", new File([text], fileName, { type: "application/geo+json" }));
    const request = new Request(`${ORIGIN}/geography`, {
      method: "POST",
      body: form,
      headers: { Cookie: cookie, Origin: ORIGIN },
    });
    return settle(() => geographyAction(routeArgs(request)));
  }

  it("refuses a bad file with the reasons, and keeps the old layer and the stored checks", async () => {
    const before = await db("geo_layers").where({ kind: "drainage_basins" }).first();
    const audits = await db("audit_events").where({ action: "geo_layer_replaced" }).count({ n: "*" });
    const projected = JSON.stringify({
      type: "FeatureCollection",
      features: [
        {
          type: "Feature",
          properties: { name: "Metres" },
          geometry: {
            type: "Polygon",
            coordinates: [
              [
                [500000, 4280000],
                [510000, 4280000],
                [510000, 4290000],
                [500000, 4280000],
              ],
            ],
          },
        },
      ],
    });
    const outcome = await upload("drainage_basins", projected);
    const value = outcome.value as { data: { errors: string[] }; init: { status: number } };
    expect(value.init.status).toBe(400);
    expect(value.data.errors.join(" ")).toMatch(/WGS 84/);
    expect(value.data.errors.join(" ")).toMatch(/Nothing was changed/);

    const after = await db("geo_layers").where({ kind: "drainage_basins" }).first();
    expect(after.version).toBe(before.version);
    expect(after.geojson).toBe(before.geojson);
    expect(await db("audit_events").where({ action: "geo_layer_replaced" }).count({ n: "*" })).toEqual(audits);
    expect((await db("events").where({ id: ids.atStation }).first()).drainage_basin).toBe("South Fork");

    const notJson = await upload("drainage_basins", "this is not geojson");
    expect((notJson.value as { init: { status: number } }).init.status).toBe(400);
  });

  it("replaces a valid layer, rechecks every event and writes the audit log", async () => {
    const before = await db("geo_layers").where({ kind: "drainage_basins" }).first();
    const everything = JSON.stringify({
      type: "FeatureCollection",
      features: [
        {
          type: "Feature",
          properties: { name: "Whole district" },
          geometry: {
            type: "Polygon",
            coordinates: [
              [
                [-98.4, 38.5],
                [-98.0, 38.5],
                [-98.0, 38.9],
                [-98.4, 38.9],
                [-98.4, 38.5],
              ],
            ],
          },
        },
      ],
    });
    const outcome = await upload("drainage_basins", everything, environmental, "whole.geojson");
    expect(outcome.thrown).toBe(true);
    expect((outcome.value as Response).status).toBe(302);
    const after = await db("geo_layers").where({ kind: "drainage_basins" }).first();
    expect(after.version).toBe(before.version + 1);
    expect(after.file_name).toBe("whole.geojson");
    expect((await db("events").where({ id: ids.atStation }).first()).drainage_basin).toBe("Whole district");
    const audit = await db("audit_events").where({ action: "geo_layer_replaced" }).orderBy("id", "desc").first();
    expect(audit.summary).toMatch(/Drainage basins: 1 feature from whole\.geojson/);
  });

  it("is refused to an officer", async () => {
    const outcome = await upload("drainage_basins", demoText("drainage_basins"), officer);
    expect((outcome.value as { init?: { status?: number } }).init?.status).toBe(403);
  });
});

describe("layers and tiles for the maps", () => {
  it("serves a layer as GeoJSON and the waterway buffer as polygons", async () => {
    const waterways = await json(
      await layerLoader(routeArgs(getRequest("/api/geo/layers/waterways", { Cookie: chief }), { kind: "waterways" })),
    );
    expect(waterways.features.map((f: { properties: { name: string } }) => f.properties.name)).toContain("Alder Creek");
    const buffer = await json(
      await layerLoader(
        routeArgs(getRequest("/api/geo/layers/waterway_buffer", { Cookie: chief }), { kind: "waterway_buffer" }),
      ),
    );
    expect(buffer.features.every((f: { geometry: { type: string } }) => /Polygon/.test(f.geometry.type))).toBe(true);
    expect(
      await status(() =>
        layerLoader(routeArgs(getRequest("/api/geo/layers/nope", { Cookie: chief }), { kind: "nope" })),
      ),
    ).toBe(404);
  });

  it("serves bundled tiles as protobuf with cache headers, empty where there is nothing", async () => {
    const tile = (z: string, x: string, file: string) =>
      tileLoader(routeArgs(getRequest(`/tiles/${z}/${x}/${file}`, { Cookie: chief }), { z, x, file }));
    const district = (await tile("12", "930", "1569.pbf")) as Response;
    expect(district.headers.get("Content-Type")).toBe("application/x-protobuf");
    expect(district.headers.get("Cache-Control")).toMatch(/max-age=\d+/);
    expect((await district.arrayBuffer()).byteLength).toBeGreaterThan(100);
    const sea = (await tile("14", "0", "0.pbf")) as Response;
    expect(sea.status).toBe(200);
    expect((await sea.arrayBuffer()).byteLength).toBe(0);
    expect(await status(() => tile("15", "0", "0.pbf"))).toBe(404);
    expect(await status(() => tile("3", "1", "../../secret"))).toBe(404);
  });
});
