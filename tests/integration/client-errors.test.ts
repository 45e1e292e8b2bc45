// Requests that once answered 500 answer a clear 4xx: references to records that do not exist,
// numbers past their column's range, bodies that are not forms, layer members of the wrong type,
// record ids that are not ids, and unknown API addresses.
import { randomUUID } from "node:crypto";
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { action as apparatusAction } from "~/routes/apparatus.$apparatusId";
import { loader as apiEventLoader } from "~/routes/api.events.$id";
import { loader as apiNotFoundLoader } from "~/routes/api.not-found";
import { action as editAction, loader as editLoader } from "~/routes/events.$id.edit";
import { loader as eventLoader } from "~/routes/events.$id";
import { action as newAction } from "~/routes/events.new";
import { action as geographyAction } from "~/routes/geography";
import { action as productAction, loader as productLoader } from "~/routes/products.$productId";
import { loader as stationLoader } from "~/routes/stations.$stationId";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeStation } from "../support/usage-fixtures";

const ORIGIN = "http://127.0.0.1:3000";
let officer: string;
let chief: string;
let environmental: string;
let stationId: number;

beforeAll(async () => {
  await ensureAgency();
  stationId = (await makeStation()).id;
  const cookieOf = async (roles: Parameters<typeof makeUser>[0]) =>
    signIn((await makeUser(roles, "Errors Test", { stationId })).email, TEST_PASSWORD);
  officer = await cookieOf(["officer"]);
  chief = await cookieOf(["chief"]);
  environmental = await cookieOf(["environmental"]);
});

type Answer = { status: number; body: unknown };

async function answer(run: () => Promise<unknown>): Promise<Answer> {
  const { value } = await settle(run);
  if (value instanceof Response) {
    const text = await value.text();
    let body: unknown = text;
    try {
      body = JSON.parse(text);
    } catch {
      // not JSON
    }
    return { status: value.status, body };
  }
  const shaped = value as { init?: { status?: number } | null; data?: unknown };
  return { status: shaped?.init?.status ?? 200, body: shaped?.data ?? value };
}

/** The field errors of a conform reply. */
function fieldErrorsOf(body: unknown): Record<string, string[]> {
  return ((body as { result?: { error?: Record<string, string[]> } })?.result?.error ?? {}) as Record<string, string[]>;
}

const count = async (table: string) => Number((await db(table).count({ count: "*" }))[0].count);

function report(overrides: Record<string, string> = {}): Record<string, string> {
  return {
    intent: "file",
    submissionKey: randomUUID(),
    number: `CE-${randomUUID().slice(0, 8)}`,
    kind: "training",
    startedAt: "2026-04-01T09:00",
    clearedAt: "2026-04-01T10:00",
    address: "12 Drill Yard",
    latitude: "38.7",
    longitude: "-98.2",
    stationId: String(stationId),
    "discharges[0].flow": "100",
    "discharges[0].flowUnit": "gpm",
    "discharges[0].basis": "water",
    "discharges[0].minutes": "5",
    "dispositions[0].disposition": "soil",
    "dispositions[0].sharePercent": "100",
    ...overrides,
  };
}

const newReport = (fields: Record<string, string>) =>
  answer(() => newAction(routeArgs(formRequest("/events/new", fields, { Cookie: officer }))));

describe("references to records that do not exist", () => {
  it.each([
    ["stationId", "+5000000"],
    ["stationId", "0x7fffffff"],
    ["discharges[0].apparatusId", "2147483648"],
    ["discharges[0].productId", "0x10000"],
    ["tankReadings[0].apparatusId", "4294967296"],
  ])("filing with %s=%s answers 400 at that field and writes nothing", async (field, value) => {
    const extra: Record<string, string> = { [field]: value };
    if (field.startsWith("discharges") && field.endsWith("productId")) extra["discharges[0].percent"] = "3";
    if (field.startsWith("tankReadings")) extra["tankReadings[0].refillGal"] = "5";
    const events = await count("events");
    const reply = await newReport(report(extra));
    expect(reply.status).toBe(400);
    const key = field.replace(/\[(\d+)\]/g, "[$1]");
    expect(fieldErrorsOf(reply.body)[key]?.[0]).toMatch(/no longer|does not exist|not in the list|Choose/);
    expect(await count("events")).toBe(events);
  });

  it.each([
    ["stationId", "+5000000"],
    ["discharges[0].apparatusId", "2147483648"],
    ["discharges[0].productId", "0x10000"],
  ])("a draft with %s=%s answers 400 at that field, keeps the typing and writes nothing", async (field, value) => {
    const events = await count("events");
    const fields = { ...report({ [field]: value }), intent: "save-draft" };
    const reply = await newReport(fields);
    expect(reply.status).toBe(400);
    expect(fieldErrorsOf(reply.body)[field]?.length).toBeGreaterThan(0);
    const kept = (reply.body as { result: { initialValue: Record<string, unknown> } }).result.initialValue;
    expect(JSON.stringify(kept)).toContain(value.replace("+", ""));
    expect(await count("events")).toBe(events);
  });

  it("a draft saved on an edit page with a missing station answers 400 too", async () => {
    const saved = await newReport({ ...report(), intent: "save-draft" });
    expect(saved.status).toBe(302);
    const draft = await db("events").orderBy("id", "desc").first();
    const request = formRequest(
      `/events/${draft.id}/edit`,
      { ...report({ stationId: "+5000000" }), intent: "save-draft", version: String(draft.version) },
      { Cookie: officer },
    );
    const reply = await answer(() => editAction(routeArgs(request, { id: String(draft.id) })));
    expect(reply.status).toBe(400);
    expect(fieldErrorsOf(reply.body).stationId?.length).toBeGreaterThan(0);
  });

  it("an apparatus with a station that does not exist answers 400 at the station", async () => {
    const request = formRequest(
      "/apparatus/new",
      { unitId: `E-${randomUUID().slice(0, 6)}`, stationId: "+5000000" },
      {
        Cookie: chief,
      },
    );
    const reply = await answer(() => apparatusAction(routeArgs(request, { apparatusId: "new" })));
    expect(reply.status).toBe(400);
    expect(fieldErrorsOf(reply.body).stationId?.length).toBeGreaterThan(0);
  });
});

describe("numbers past their column's range", () => {
  const product = (overrides: Record<string, string>) => ({
    name: `Range test ${randomUUID().slice(0, 6)} (test)`,
    foamClass: "B",
    foamType: "f3",
    nominalPercents: "3",
    ...overrides,
  });

  it.each([
    ["unitCostPerGal", "4294967296"],
    ["unitCostPerGal", "100000000"],
    ["pfasContent", "4294967296"],
  ])("a product with %s=%s answers 400 at the field", async (field, value) => {
    const extra: Record<string, string> = { [field]: value };
    if (field === "pfasContent")
      Object.assign(extra, { pfasContaining: "on", pfasContentUnit: "mg_per_kg", pfasContentSource: "lab" });
    const products = await count("foam_products");
    const request = formRequest("/products/new", product(extra), { Cookie: environmental });
    const reply = await answer(() => productAction(routeArgs(request, { productId: "new" })));
    expect(reply.status).toBe(400);
    expect(fieldErrorsOf(reply.body)[field]?.[0]).toMatch(/at most/);
    expect(await count("foam_products")).toBe(products);
  });

  it("the largest value the column holds is accepted", async () => {
    const request = formRequest("/products/new", product({ unitCostPerGal: "99999999.99" }), { Cookie: environmental });
    const reply = await answer(() => productAction(routeArgs(request, { productId: "new" })));
    expect(reply.status).toBe(302);
  });
});

describe("bodies that are not forms", () => {
  const post = (body: BodyInit | null, headers: Record<string, string>) =>
    new Request(`${ORIGIN}/events/new`, {
      method: "POST",
      body,
      headers: { Origin: ORIGIN, Cookie: officer, ...headers },
    });

  it.each([
    ["JSON", JSON.stringify({ intent: "file" }), { "Content-Type": "application/json" }, 415],
    ["text", "intent=file", { "Content-Type": "text/plain" }, 415],
    ["no body", null, {}, 415],
    [
      "broken multipart",
      '--x\r\nContent-Disposition: form-data; name="a"\r\n\r\nb',
      { "Content-Type": "multipart/form-data; boundary=x" },
      400,
    ],
    ["multipart without boundary", "a=b", { "Content-Type": "multipart/form-data" }, 400],
  ] as const)("%s is refused with 400 or 415", async (_label, body, headers, status) => {
    const reply = await answer(() => newAction(routeArgs(post(body, headers))));
    expect(reply.status).toBe(status);
  });
});

describe("layer files with members of the wrong type", () => {
  const upload = (text: string) => {
    const form = new FormData();
    form.append("kind", "drainage_basins");
    form.append("file", new File([text], "layer.geojson", { type: "application/geo+json" }));
    return answer(() =>
      geographyAction(
        routeArgs(
          new Request(`${ORIGIN}/geography`, {
            method: "POST",
            body: form,
            headers: { Origin: ORIGIN, Cookie: environmental },
          }),
        ),
      ),
    );
  };
  const square = [
    [
      [-98, 38],
      [-97.9, 38],
      [-97.9, 38.1],
      [-98, 38],
    ],
  ];

  it.each([
    ["the collection's type", { type: { toString: 1 }, features: [] }],
    ["a feature's type", { type: "FeatureCollection", features: [{ type: { toString: 1 }, geometry: null }] }],
    [
      "a geometry's type",
      {
        type: "FeatureCollection",
        features: [
          { type: "Feature", properties: { name: "A" }, geometry: { type: { toString: 1 }, coordinates: square } },
        ],
      },
    ],
    [
      "the coordinate system's name",
      { type: "FeatureCollection", crs: { properties: { name: { toString: 1 } } }, features: [] },
    ],
    [
      "a feature's name",
      {
        type: "FeatureCollection",
        features: [
          {
            type: "Feature",
            properties: { name: { toString: 1 } },
            geometry: { type: "Polygon", coordinates: square },
          },
        ],
      },
    ],
  ])("%s as an object answers 400 with the reason", async (_label, layer) => {
    const reply = await upload(JSON.stringify(layer));
    expect(reply.status).toBe(400);
    const errors = (reply.body as { errors: string[] }).errors;
    expect(errors.join(" ")).toMatch(/string|type|name|not a GeoJSON Feature/i);
  });
});

describe("record ids that are not ids", () => {
  it.each(["abc", "1e3", "-1", "0", "1.5", "+5", "0x10", " 7", "99999999999"])("/events/%s is a 404", async (id) => {
    const loaders = [eventLoader, editLoader];
    for (const loader of loaders) {
      const reply = await answer(() =>
        loader(routeArgs(getRequest(`/events/${encodeURIComponent(id)}`, { Cookie: officer }), { id })),
      );
      expect(reply.status).toBe(404);
    }
  });

  it.each(["abc", "1e3", "-1"])("/products/%s and /stations/… with it are 404s", async (id) => {
    expect(
      (
        await answer(() =>
          productLoader(routeArgs(getRequest(`/products/${id}`, { Cookie: environmental }), { productId: id })),
        )
      ).status,
    ).toBe(404);
    expect(
      (
        await answer(() =>
          stationLoader(routeArgs(getRequest(`/stations/${id}`, { Cookie: chief }), { stationId: id })),
        )
      ).status,
    ).toBe(404);
  });

  it("/api/events/1e3 is a JSON 404", async () => {
    const reply = await answer(() =>
      apiEventLoader(routeArgs(getRequest("/api/events/1e3", { Cookie: officer }), { id: "1e3" })),
    );
    expect(reply.status).toBe(404);
    expect(reply.body).toMatchObject({ error: expect.any(String) });
  });
});

describe("unknown API addresses", () => {
  it("answer a JSON 404, not a page", async () => {
    const reply = await answer(() => apiNotFoundLoader());
    expect(reply.status).toBe(404);
    expect(reply.body).toEqual({ error: "No such API route." });
  });
});
