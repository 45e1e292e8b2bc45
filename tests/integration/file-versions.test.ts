import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { getObject } from "~/lib/storage.server";
import { sha256Hex } from "~/models/download-audit.server";
import { replaceLayer } from "~/models/geography.server";
import { loader as geographyLoader } from "~/routes/geography";
import { loader as layerVersionLoader } from "~/routes/geography.layers.$kind.versions.$versionId";
import { action as productAction, loader as productLoader } from "~/routes/products.$productId";
import { loader as sheetVersionLoader } from "~/routes/products.$productId.safety-sheet.versions.$versionId";
import { makeProductRow } from "../support/catalogue-factories";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { startFileStore } from "../support/file-store";
import { getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";

const ORIGIN = "http://127.0.0.1:3000";
let closeFileStore: () => Promise<void>;
let enviro: Awaited<ReturnType<typeof makeUser>>;
let cookie: string;

const jurisdiction = (name: string) =>
  JSON.stringify({
    type: "FeatureCollection",
    features: [
      {
        type: "Feature",
        properties: { name },
        geometry: {
          type: "Polygon",
          coordinates: [
            [
              [-98.3, 38.6],
              [-98.0, 38.6],
              [-98.0, 38.9],
              [-98.3, 38.9],
              [-98.3, 38.6],
            ],
          ],
        },
      },
    ],
  });

beforeAll(async () => {
  closeFileStore = await startFileStore("file-versions");
  enviro = await makeUser(["environmental"], "Version Keeper");
  cookie = await signIn(enviro.email, TEST_PASSWORD, "10.9.0.1");
});

afterAll(async () => {
  await closeFileStore();
});

describe("a replaced GeoJSON layer", () => {
  it("keeps its earlier file, lists it on the layer page, serves it and names both files in the audit", async () => {
    // A layer loaded before versions were kept (as the demo seed loads it): no file in the store yet.
    const first = jurisdiction("Test district, first file");
    const seeded = await replaceLayer(
      { kind: "jurisdiction", text: first, fileName: "district-1.geojson" },
      null,
      null,
      {
        recheckEvents: false,
        keepFile: false,
      },
    );
    expect(seeded.ok).toBe(true);
    const second = jurisdiction("Test district, second file");
    await replaceLayer({ kind: "jurisdiction", text: second, fileName: "district-2.geojson" }, enviro, null, {
      recheckEvents: false,
    });
    const third = jurisdiction("Test district, third file");
    await replaceLayer({ kind: "jurisdiction", text: third, fileName: "district-3.geojson" }, enviro, null, {
      recheckEvents: false,
    });

    const page = await geographyLoader(routeArgs(getRequest("/geography", { Cookie: cookie })));
    const earlier = page.earlier.jurisdiction;
    expect(earlier.map((version) => version.fileName)).toEqual(["district-2.geojson", "district-1.geojson"]);
    expect(earlier[0]).toMatchObject({
      uploadedBy: "Version Keeper",
      sha256: sha256Hex(new TextEncoder().encode(second)),
    });

    const download = (await layerVersionLoader(
      routeArgs(getRequest(`/geography/layers/jurisdiction/versions/${earlier[1].id}`, { Cookie: cookie }), {
        kind: "jurisdiction",
        versionId: String(earlier[1].id),
      }),
    )) as Response;
    expect(JSON.parse(await download.text()).features[0].properties.name).toBe("Test district, first file");
    const downloadAudit = await db("audit_events")
      .where({ action: "layer_file_downloaded", actor_user_id: enviro.id })
      .orderBy("id", "desc")
      .first();
    expect(JSON.parse(downloadAudit.after_json)).toMatchObject({
      versionId: earlier[1].id,
      fileName: "district-1.geojson",
    });

    const audit = await db("audit_events")
      .where({ action: "geo_layer_replaced", entity_id: "jurisdiction", actor_user_id: enviro.id })
      .orderBy("id", "desc")
      .first();
    const before = JSON.parse(audit.before_json);
    const after = JSON.parse(audit.after_json);
    expect(before.file).toMatchObject({ key: earlier[0].key, fileName: "district-2.geojson" });
    expect(after.file).toMatchObject({
      fileName: "district-3.geojson",
      sha256: sha256Hex(new TextEncoder().encode(third)),
    });
    expect(new TextDecoder().decode((await getObject(before.file.key)).body)).toBe(second);
  });

  it("is a 404 for a file of another layer or one that does not exist", async () => {
    const [version] = await db("file_versions")
      .where({ subject: "geo_layer", subject_id: "jurisdiction" })
      .select("id");
    for (const [kind, versionId] of [
      ["waterways", String(version.id)],
      ["jurisdiction", "999999"],
      ["nope", "1"],
    ]) {
      const outcome = await settle(() =>
        layerVersionLoader(
          routeArgs(getRequest(`/geography/layers/${kind}/versions/${versionId}`, { Cookie: cookie }), {
            kind,
            versionId,
          }),
        ),
      );
      expect((outcome.value as { init?: { status?: number } }).init?.status, `${kind} ${versionId}`).toBe(404);
    }
  });
});

describe("a replaced safety sheet", () => {
  const pdf = (text: string) => new Uint8Array(Buffer.from(`%PDF-1.4\n% ${text}\n%%EOF\n`));

  function upload(
    productId: number,
    version: number,
    name: string,
    body: Uint8Array<ArrayBuffer>,
    values: Record<string, string>,
  ) {
    const form = new FormData();
    for (const [key, value] of Object.entries({ ...values, version: String(version) })) form.append(key, value);
    form.append("safetySheet", new File([body], name, { type: "application/pdf" }));
    return new Request(`${ORIGIN}/products/${productId}`, {
      method: "POST",
      body: form,
      headers: { Cookie: cookie, Origin: ORIGIN },
    });
  }

  it("keeps the earlier sheet, lists it on the product page and names both in the audit", async () => {
    const product = await makeProductRow({ foamClass: "A" });
    const values = {
      name: product.name,
      maker: "Invented maker",
      foamClass: "A",
      foamType: "class-a",
      nominalPercents: "0.5",
      active: "on",
    };
    const first = pdf("first sheet");
    const second = pdf("second sheet");
    const one = await settle(() =>
      productAction(
        routeArgs(upload(product.id, 1, "sheet-one.pdf", first, values), { productId: String(product.id) }),
      ),
    );
    expect((one.value as Response).status).toBe(302);
    const two = await settle(() =>
      productAction(
        routeArgs(upload(product.id, 2, "sheet-two.pdf", second, values), { productId: String(product.id) }),
      ),
    );
    expect((two.value as Response).status).toBe(302);

    const page = await productLoader(
      routeArgs(getRequest(`/products/${product.id}`, { Cookie: cookie }), { productId: String(product.id) }),
    );
    expect(page.product?.safetySheetName).toBe("sheet-two.pdf");
    expect(page.earlierSheets.map((version) => version.fileName)).toEqual(["sheet-one.pdf"]);
    const earlier = page.earlierSheets[0];
    expect(earlier.sha256).toBe(sha256Hex(first));

    const download = (await sheetVersionLoader(
      routeArgs(getRequest(`/products/${product.id}/safety-sheet/versions/${earlier.id}`, { Cookie: cookie }), {
        productId: String(product.id),
        versionId: String(earlier.id),
      }),
    )) as Response;
    expect(new Uint8Array(await download.arrayBuffer())).toEqual(first);

    const audit = await db("audit_events")
      .where({ action: "product_updated", entity_id: String(product.id) })
      .orderBy("id", "desc")
      .first();
    expect(JSON.parse(audit.before_json).safetySheetFile).toMatchObject({
      fileName: "sheet-one.pdf",
      key: earlier.key,
    });
    expect(JSON.parse(audit.after_json).safetySheetFile).toMatchObject({
      fileName: "sheet-two.pdf",
      sha256: sha256Hex(second),
    });
    expect(audit.summary).toMatch(/sheet-two\.pdf replaces sheet-one\.pdf/);
  });
});
