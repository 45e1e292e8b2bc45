import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { env } from "~/lib/env.server";
import { apparatusFactsMap, listActiveApparatus, listActiveProducts, productFactsMap } from "~/models/catalogue.server";
import { action as apparatusAction } from "~/routes/apparatus.$apparatusId";
import { loader as productsLoader } from "~/routes/products";
import { action as productAction, loader as productLoader } from "~/routes/products.$productId";
import { loader as sheetLoader } from "~/routes/products.$productId.safety-sheet";
import { action as stationAction } from "~/routes/stations.$stationId";
import { makeApparatusRow, makeProductRow, makeStationRow } from "../support/catalogue-factories";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { startFileStore } from "../support/file-store";
import { signIn } from "../support/session";

const ORIGIN = "http://127.0.0.1:3000";

type Reply = { error?: Record<string, string[] | null> };
function replyOf(value: unknown): { status: number; error: Record<string, string[] | null> } {
  const result = value as { data: { result: Reply }; init: { status: number } | null };
  return { status: result.init?.status ?? 200, error: result.data.result.error ?? {} };
}
const statusOf = (value: unknown) =>
  value instanceof Response ? value.status : ((value as { init?: { status?: number } }).init?.status ?? 200);

async function signedIn(roles: Parameters<typeof makeUser>[0]) {
  const user = await makeUser(roles);
  return { user, cookie: await signIn(user.email, TEST_PASSWORD) };
}

function multipartRequest(path: string, fields: Record<string, string>, cookie: string, file?: File): Request {
  const body = new FormData();
  for (const [key, value] of Object.entries(fields)) body.append(key, value);
  if (file) body.append("safetySheet", file);
  return new Request(`${ORIGIN}${path}`, { method: "POST", body, headers: { Cookie: cookie, Origin: ORIGIN } });
}

const countOf = async (table: string, where: Record<string, unknown> = {}) =>
  Number((await db(table).where(where).count({ n: "*" }))[0].n);

const PDF_BYTES = new TextEncoder().encode("%PDF-1.4\n% test safety sheet\n1 0 obj <<>> endobj\n%%EOF\n");

let closeFileStore: () => Promise<void>;
beforeAll(async () => {
  closeFileStore = await startFileStore("catalogue");
});
afterAll(() => closeFileStore());

const legacyProduct = {
  name: "Legacy AFFF for a test (test)",
  maker: "Invented maker",
  foamClass: "B",
  foamType: "afff",
  nominalPercents: "3, 6",
  pfasContaining: "on",
  pfasContent: "10",
  pfasContentUnit: "g_per_l",
  pfasContentBasis: "Total PFAS, estimated",
  pfasContentSource: "Estimate from the legacy AFFF range (test data)",
  unitCostPerGal: "35.50",
  active: "on",
};

describe("foam products", () => {
  it("lets an environmental officer add a product with a safety sheet, audited, and the sheet reads back", async () => {
    const { user, cookie } = await signedIn(["environmental"]);
    const file = new File([PDF_BYTES], "legacy-afff.pdf", { type: "application/pdf" });
    const outcome = await settle(() =>
      productAction(routeArgs(multipartRequest("/products/new", legacyProduct, cookie, file), { productId: "new" })),
    );
    expect(statusOf(outcome.value)).toBe(302);
    const row = await db("foam_products").where({ name: legacyProduct.name }).first();
    expect(row).toMatchObject({
      foam_class: "B",
      foam_type: "afff",
      nominal_percents: "3,6",
      pfas_content_unit: "g_per_l",
      safety_sheet_name: "legacy-afff.pdf",
    });
    expect(Number(row.pfas_content)).toBe(10);
    expect(Boolean(row.pfas_containing)).toBe(true);
    const audit = await db("audit_events")
      .where({ entity_type: "foam_product", entity_id: String(row.id) })
      .first();
    expect(audit).toMatchObject({ action: "product_created", actor_user_id: user.id });
    expect(JSON.parse(audit.after_json)).toMatchObject({ name: legacyProduct.name, nominalPercents: [3, 6] });

    const sheet = (await sheetLoader(
      routeArgs(getRequest(`/products/${row.id}/safety-sheet`, { Cookie: cookie }), { productId: String(row.id) }),
    )) as Response;
    expect(sheet.headers.get("Content-Type")).toBe("application/pdf");
    expect(new Uint8Array(await sheet.arrayBuffer())).toEqual(PDF_BYTES);
  });

  it("saves an edit with before and after in the audit row, keeping the stored safety sheet", async () => {
    const { user, cookie } = await signedIn(["environmental"]);
    const product = await makeProductRow({
      unitCostPerGal: 30,
      safetySheetKey: "safety-sheets/kept.pdf",
      safetySheetName: "kept.pdf",
    });
    const outcome = await settle(() =>
      productAction(
        routeArgs(
          multipartRequest(
            `/products/${product.id}`,
            {
              name: product.name,
              foamClass: "B",
              foamType: "f3",
              nominalPercents: "3",
              unitCostPerGal: "44.25",
              version: "1",
            },
            cookie,
          ),
          { productId: String(product.id) },
        ),
      ),
    );
    expect(statusOf(outcome.value)).toBe(302);
    const row = await db("foam_products").where({ id: product.id }).first();
    expect(Number(row.unit_cost_per_gal)).toBe(44.25);
    expect(Boolean(row.active)).toBe(false);
    expect(row.safety_sheet_key).toBe("safety-sheets/kept.pdf");
    const audit = await db("audit_events")
      .where({ entity_type: "foam_product", entity_id: String(product.id), action: "product_updated" })
      .first();
    expect(audit.actor_user_id).toBe(user.id);
    expect(JSON.parse(audit.before_json)).toMatchObject({ unitCostPerGal: 30, active: true });
    expect(JSON.parse(audit.after_json)).toMatchObject({ unitCostPerGal: 44.25, active: false, hasSafetySheet: true });
  });

  it("shows every validation error at its field and writes nothing", async () => {
    const { cookie } = await signedIn(["environmental"]);
    const before = await countOf("foam_products");
    const auditsBefore = await countOf("audit_events", { entity_type: "foam_product" });
    const outcome = await settle(() =>
      productAction(
        routeArgs(
          multipartRequest(
            "/products/new",
            {
              name: "",
              foamClass: "A",
              foamType: "afff",
              nominalPercents: "3, abc",
              pfasContent: "-2",
              unitCostPerGal: "lots",
            },
            cookie,
          ),
          { productId: "new" },
        ),
      ),
    );
    const reply = replyOf(outcome.value);
    expect(reply.status).toBe(400);
    expect(reply.error.name?.[0]).toMatch(/name/);
    expect(reply.error.nominalPercents?.[0]).toMatch(/percentages above 0 and below 100/);
    expect(reply.error.pfasContent?.[0]).toMatch(/zero or more/);
    expect(reply.error.unitCostPerGal?.[0]).toMatch(/zero or more/);
    expect(await countOf("foam_products")).toBe(before);
    expect(await countOf("audit_events", { entity_type: "foam_product" })).toBe(auditsBefore);
  });

  it("asks for the unit and the source of a PFAS figure, and a Class B type for Class B", async () => {
    const { cookie } = await signedIn(["environmental"]);
    const outcome = await settle(() =>
      productAction(
        routeArgs(
          multipartRequest(
            "/products/new",
            { name: "No unit (test)", foamClass: "B", foamType: "class-a", nominalPercents: "3", pfasContent: "5" },
            cookie,
          ),
          { productId: "new" },
        ),
      ),
    );
    const reply = replyOf(outcome.value);
    expect(reply.error.pfasContentUnit?.[0]).toMatch(/unit/);
    expect(reply.error.pfasContentSource?.[0]).toMatch(/where the PFAS figure comes from/);
    expect(reply.error.pfasContaining?.[0]).toMatch(/PFAS-containing/);
    expect(reply.error.foamType?.[0]).toMatch(/Class B type/);
    expect(await countOf("foam_products", { name: "No unit (test)" })).toBe(0);
  });

  it("refuses a file that is not a PDF and a duplicate name, keeping the record unchanged", async () => {
    const { cookie } = await signedIn(["environmental"]);
    const existing = await makeProductRow();
    const fake = new File([new TextEncoder().encode("MZ not a pdf")], "sheet.pdf", { type: "application/pdf" });
    const notPdf = await settle(() =>
      productAction(
        routeArgs(
          multipartRequest(
            `/products/${existing.id}`,
            { name: existing.name, foamClass: "B", foamType: "f3", nominalPercents: "3" },
            cookie,
            fake,
          ),
          { productId: String(existing.id) },
        ),
      ),
    );
    expect(replyOf(notPdf.value).error.safetySheet?.[0]).toMatch(/not a PDF/);
    const other = await makeProductRow();
    const duplicate = await settle(() =>
      productAction(
        routeArgs(
          multipartRequest(
            `/products/${other.id}`,
            { name: existing.name, foamClass: "B", foamType: "f3", nominalPercents: "3, 6", version: "1" },
            cookie,
          ),
          { productId: String(other.id) },
        ),
      ),
    );
    expect(replyOf(duplicate.value).error.name?.[0]).toMatch(/already has this name/);
    expect((await db("foam_products").where({ id: other.id }).first()).nominal_percents).toBe("3");
  });

  it("saves nothing when the file store is down, and says so at the file field", async () => {
    const { cookie } = await signedIn(["environmental"]);
    const working = env().S3_ENDPOINT;
    env().S3_ENDPOINT = "http://127.0.0.1:9";
    try {
      const file = new File([PDF_BYTES], "sheet.pdf", { type: "application/pdf" });
      const outcome = await settle(() =>
        productAction(
          routeArgs(
            multipartRequest(
              "/products/new",
              { name: "Store down (test)", foamClass: "A", foamType: "class-a", nominalPercents: "0.3" },
              cookie,
              file,
            ),
            { productId: "new" },
          ),
        ),
      );
      const reply = replyOf(outcome.value);
      expect(reply.status).toBe(503);
      expect(reply.error.safetySheet?.[0]).toMatch(/nothing was saved/);
      expect(await countOf("foam_products", { name: "Store down (test)" })).toBe(0);
    } finally {
      env().S3_ENDPOINT = working;
    }
  });

  it("lets the chief read the catalogue but not change it; an officer may not open it", async () => {
    const chief = await signedIn(["chief"]);
    const listed = (await productsLoader(routeArgs(getRequest("/products", { Cookie: chief.cookie })))) as {
      canEdit: boolean;
    };
    expect(listed.canEdit).toBe(false);
    const product = await makeProductRow();
    const page = (await productLoader(
      routeArgs(getRequest(`/products/${product.id}`, { Cookie: chief.cookie }), { productId: String(product.id) }),
    )) as { canEdit: boolean; product: { name: string } };
    expect(page).toMatchObject({ canEdit: false, product: { name: product.name } });
    const write = await settle(() =>
      productAction(routeArgs(multipartRequest("/products/new", legacyProduct, chief.cookie), { productId: "new" })),
    );
    expect(statusOf(write.value)).toBe(403);
    const officer = await signedIn(["officer"]);
    const read = await settle(() => productsLoader(routeArgs(getRequest("/products", { Cookie: officer.cookie }))));
    expect(statusOf(read.value)).toBe(403);
  });
});

describe("stations and apparatus", () => {
  it("lets the chief add an apparatus with its foam system and outlets, audited", async () => {
    const { user, cookie } = await signedIn(["chief"]);
    const station = await makeStationRow();
    const unitId = `E-${Date.now() % 100000}`;
    const outcome = await settle(() =>
      apparatusAction(
        routeArgs(
          formRequest(
            "/apparatus/new",
            {
              unitId,
              description: "Test engine (test)",
              stationId: String(station.id),
              concentrateTankGal: "30",
              proportionerMaxConcentrateGpm: "1.5",
              proportionerType: "direct_injection",
              waterFlowMinGpm: "5",
              waterFlowMaxGpm: "300",
              compressedAirCfm: "150",
              active: "on",
              "outlets[0].name": "Crosslay 1",
              "outlets[0].foamCapable": "on",
              "outlets[0].defaultFlowGpm": "100",
              "outlets[0].defaultFlowBasis": "water",
              "outlets[0].defaultMethod": "compressed_air",
              "outlets[1].name": "Deck gun",
              "outlets[1].defaultFlowGpm": "750",
              "outlets[1].defaultFlowBasis": "water",
              "outlets[1].defaultMethod": "monitor",
            },
            { Cookie: cookie },
          ),
          { apparatusId: "new" },
        ),
      ),
    );
    expect(statusOf(outcome.value)).toBe(302);
    const row = await db("apparatus").where({ unit_id: unitId }).first();
    const active = (await listActiveApparatus()).find((item) => item.id === row.id);
    expect(active).toEqual({
      id: row.id,
      unitId,
      description: "Test engine (test)",
      stationId: station.id,
      proportionerMaxConcentrateGpm: 1.5,
      proportionerType: "direct_injection",
      waterFlowMinGpm: 5,
      waterFlowMaxGpm: 300,
      compressedAirCfm: 150,
      concentrateTankGal: 30,
      outlets: [
        {
          name: "Crosslay 1",
          foamCapable: true,
          defaultFlowGpm: 100,
          defaultFlowBasis: "water",
          defaultMethod: "compressed_air",
        },
        {
          name: "Deck gun",
          foamCapable: false,
          defaultFlowGpm: 750,
          defaultFlowBasis: "water",
          defaultMethod: "monitor",
        },
      ],
    });
    const audit = await db("audit_events")
      .where({ entity_type: "apparatus", entity_id: String(row.id) })
      .first();
    expect(audit).toMatchObject({ action: "apparatus_created", actor_user_id: user.id });
    const facts = await apparatusFactsMap([row.id]);
    expect(facts.get(row.id)).toEqual({
      id: row.id,
      unitId,
      proportionerMaxConcentrateGpm: 1.5,
      proportionerType: "direct_injection",
      waterFlowMinGpm: 5,
      waterFlowMaxGpm: 300,
    });
  });

  it("reports an outlet's error at that outlet and keeps the stored apparatus and outlets as they were", async () => {
    const { cookie } = await signedIn(["admin"]);
    const unit = await makeApparatusRow({
      waterFlowMinGpm: 10,
      waterFlowMaxGpm: 200,
      outlets: [{ name: "Reel", defaultFlowGpm: 20 }],
    });
    const save = (fields: Record<string, string>) =>
      settle(() =>
        apparatusAction(
          routeArgs(formRequest(`/apparatus/${unit.id}`, { unitId: unit.unitId, ...fields }, { Cookie: cookie }), {
            apparatusId: String(unit.id),
          }),
        ),
      );
    const badNumber = replyOf(
      (await save({ "outlets[0].name": "Reel", "outlets[1].name": "Monitor", "outlets[1].defaultFlowGpm": "-5" }))
        .value,
    );
    expect(badNumber.status).toBe(400);
    expect(badNumber.error["outlets[1].defaultFlowGpm"]?.[0]).toMatch(/above zero/);
    // Checks across fields run once every field is well-formed.
    const crossField = replyOf(
      (
        await save({
          waterFlowMinGpm: "400",
          waterFlowMaxGpm: "200",
          "outlets[0].name": "Reel",
          "outlets[0].defaultMethod": "compressed_air",
          "outlets[1].name": "reel",
        })
      ).value,
    );
    expect(crossField.status).toBe(400);
    expect(crossField.error.waterFlowMaxGpm?.[0]).toMatch(/at least the minimum/);
    expect(crossField.error["outlets[0].defaultMethod"]?.[0]).toMatch(/compressed-air capacity/);
    expect(crossField.error["outlets[1].name"]?.[0]).toMatch(/Two outlets/);
    const stored = await db("apparatus").where({ id: unit.id }).first();
    expect(Number(stored.water_flow_min_gpm)).toBe(10);
    expect(await db("apparatus_outlets").where({ apparatus_id: unit.id }).pluck("name")).toEqual(["Reel"]);
  });

  it("adds a station, refusing a bad latitude and a duplicate code at their fields", async () => {
    const { cookie } = await signedIn(["chief"]);
    const existing = await makeStationRow();
    const created = await settle(() =>
      stationAction(
        routeArgs(
          formRequest(
            "/stations/new",
            {
              code: `N${existing.code}`,
              name: "New station (test)",
              latitude: "38.71",
              longitude: "-98.2",
              active: "on",
            },
            { Cookie: cookie },
          ),
          { stationId: "new" },
        ),
      ),
    );
    expect(statusOf(created.value)).toBe(302);
    const duplicate = await settle(() =>
      stationAction(
        routeArgs(
          formRequest("/stations/new", { code: existing.code, name: "Again", latitude: "95" }, { Cookie: cookie }),
          { stationId: "new" },
        ),
      ),
    );
    expect(replyOf(duplicate.value).error.latitude?.[0]).toMatch(/-90 to 90/);
    const clash = await settle(() =>
      stationAction(
        routeArgs(formRequest("/stations/new", { code: existing.code, name: "Again" }, { Cookie: cookie }), {
          stationId: "new",
        }),
      ),
    );
    expect(replyOf(clash.value).error.code?.[0]).toMatch(/Another station/);
    expect(await countOf("stations", { code: existing.code })).toBe(1);
  });
});

describe("two people editing one catalogue record", () => {
  const formError = (value: unknown) => replyOf(value).error[""]?.[0];
  const typedValue = (value: unknown) =>
    (value as { data: { result: { initialValue?: Record<string, unknown> } } }).data.result.initialValue ?? {};
  const auditCount = (entityType: string, id: number) =>
    countOf("audit_events", { entity_type: entityType, entity_id: String(id) });

  it("refuses a product save from a stale page with 409, keeps the typing and changes nothing", async () => {
    const { cookie } = await signedIn(["environmental"]);
    const product = await makeProductRow({ unitCostPerGal: 30 });
    const save = (fields: Record<string, string>) =>
      settle(() =>
        productAction(
          routeArgs(
            multipartRequest(
              `/products/${product.id}`,
              { name: product.name, foamClass: "B", foamType: "f3", nominalPercents: "3", active: "on", ...fields },
              cookie,
            ),
            { productId: String(product.id) },
          ),
        ),
      );
    // Both pages were opened at version 1; the first save wins and raises the version.
    expect(statusOf((await save({ unitCostPerGal: "41", version: "1" })).value)).toBe(302);
    const saved = await db("foam_products").where({ id: product.id }).first();
    expect(saved.version).toBe(2);
    const audits = await auditCount("foam_product", product.id);

    const stale = (await save({ unitCostPerGal: "99.5", notes: "Second person's note (test)", version: "1" })).value;
    expect(statusOf(stale)).toBe(409);
    expect(formError(stale)).toMatch(/Someone else saved this product after you opened it/);
    expect(typedValue(stale)).toMatchObject({ unitCostPerGal: "99.5", notes: "Second person's note (test)" });
    // A form without its version is refused the same way.
    const missing = (await save({ unitCostPerGal: "12" })).value;
    expect(statusOf(missing)).toBe(409);

    expect(await db("foam_products").where({ id: product.id }).first()).toEqual(saved);
    expect(Number(saved.unit_cost_per_gal)).toBe(41);
    expect(await auditCount("foam_product", product.id)).toBe(audits);

    // The page reloaded at version 2 saves.
    expect(statusOf((await save({ unitCostPerGal: "99.5", version: "2" })).value)).toBe(302);
    expect(Number((await db("foam_products").where({ id: product.id }).first()).unit_cost_per_gal)).toBe(99.5);
  });

  it("keeps a stale page's new safety sheet out of the record", async () => {
    const { cookie } = await signedIn(["environmental"]);
    const product = await makeProductRow({ safetySheetKey: "safety-sheets/first.pdf", safetySheetName: "first.pdf" });
    await db("foam_products").where({ id: product.id }).update({ version: 4 });
    const file = new File([PDF_BYTES], "stale.pdf", { type: "application/pdf" });
    const outcome = await settle(() =>
      productAction(
        routeArgs(
          multipartRequest(
            `/products/${product.id}`,
            { name: product.name, foamClass: "B", foamType: "f3", nominalPercents: "3", version: "3" },
            cookie,
            file,
          ),
          { productId: String(product.id) },
        ),
      ),
    );
    expect(statusOf(outcome.value)).toBe(409);
    const row = await db("foam_products").where({ id: product.id }).first();
    expect(row).toMatchObject({
      safety_sheet_key: "safety-sheets/first.pdf",
      safety_sheet_name: "first.pdf",
      version: 4,
    });
  });

  it("refuses an apparatus save from a stale page, leaving the unit and its outlets as the first save left them", async () => {
    const { cookie } = await signedIn(["chief"]);
    const unit = await makeApparatusRow({ waterFlowMaxGpm: 200, outlets: [{ name: "Reel", defaultFlowGpm: 20 }] });
    const save = (fields: Record<string, string>) =>
      settle(() =>
        apparatusAction(
          routeArgs(
            formRequest(`/apparatus/${unit.id}`, { unitId: unit.unitId, active: "on", ...fields }, { Cookie: cookie }),
            {
              apparatusId: String(unit.id),
            },
          ),
        ),
      );
    expect(statusOf((await save({ waterFlowMaxGpm: "250", "outlets[0].name": "Crosslay", version: "1" })).value)).toBe(
      302,
    );
    const saved = await db("apparatus").where({ id: unit.id }).first();
    const audits = await auditCount("apparatus", unit.id);

    const stale = (
      await save({ waterFlowMaxGpm: "500", "outlets[0].name": "Monitor", "outlets[1].name": "Reel", version: "1" })
    ).value;
    expect(statusOf(stale)).toBe(409);
    expect(formError(stale)).toMatch(/Someone else saved this apparatus/);
    expect(typedValue(stale)).toMatchObject({ waterFlowMaxGpm: "500" });
    expect(await db("apparatus").where({ id: unit.id }).first()).toEqual(saved);
    expect(saved.version).toBe(2);
    expect(Number(saved.water_flow_max_gpm)).toBe(250);
    expect(await db("apparatus_outlets").where({ apparatus_id: unit.id }).pluck("name")).toEqual(["Crosslay"]);
    expect(await auditCount("apparatus", unit.id)).toBe(audits);
  });

  it("refuses a station save from a stale page and changes nothing", async () => {
    const { cookie } = await signedIn(["chief"]);
    const station = await makeStationRow();
    const save = (fields: Record<string, string>) =>
      settle(() =>
        stationAction(
          routeArgs(
            formRequest(`/stations/${station.id}`, { code: station.code, active: "on", ...fields }, { Cookie: cookie }),
            {
              stationId: String(station.id),
            },
          ),
        ),
      );
    expect(statusOf((await save({ name: "First name (test)", version: "1" })).value)).toBe(302);
    const saved = await db("stations").where({ id: station.id }).first();
    const audits = await auditCount("station", station.id);

    const stale = (await save({ name: "Second name (test)", version: "1" })).value;
    expect(statusOf(stale)).toBe(409);
    expect(formError(stale)).toMatch(/Someone else saved this station/);
    expect(typedValue(stale)).toMatchObject({ name: "Second name (test)" });
    expect(await db("stations").where({ id: station.id }).first()).toEqual(saved);
    expect(saved).toMatchObject({ name: "First name (test)", version: 2 });
    expect(await auditCount("station", station.id)).toBe(audits);
  });
});

describe("catalogue loaders for the usage form", () => {
  it("lists only active products with numbers, and facts maps include retired ones", async () => {
    const active = await makeProductRow({ foamClass: "A", foamType: "class-a", nominalPercents: [0.3, 0.5] });
    const retired = await makeProductRow({ active: false, pfasContaining: true });
    const listed = await listActiveProducts();
    expect(listed.find((item) => item.id === active.id)).toEqual({
      id: active.id,
      name: active.name,
      foamClass: "A",
      foamType: "class-a",
      nominalPercents: [0.3, 0.5],
      pfasContaining: false,
      heldForDisposal: false,
    });
    expect(listed.some((item) => item.id === retired.id)).toBe(false);
    const facts = await productFactsMap([active.id, retired.id, active.id]);
    expect(facts.size).toBe(2);
    expect(facts.get(retired.id)).toMatchObject({ pfasContaining: true, foamClass: "B", nominalPercents: [3] });
    expect((await productFactsMap([])).size).toBe(0);
  });
});
