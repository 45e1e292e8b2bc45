// Attachments on accuracy tests (printouts) and on disposals of concentrate (hauler's manifests),
// through the same upload path as report files, against the object-store fake: upload, list,
// download, role refusals, the one kind each takes, audited removal, and the printouts named in the
// printable test record; and a photo's kept position offered on the report's edit page.
import { PDFParse } from "pdf-parse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { getObject } from "~/lib/storage.server";
import { action as testUploadAction, loader as testListLoader } from "~/routes/api.foam-tests.$testId.attachments";
import {
  action as testRemoveAction,
  loader as testFileLoader,
} from "~/routes/foam-tests.$testId.attachments.$attachmentId";
import { loader as testThumbnailLoader } from "~/routes/foam-tests.$testId.attachments.$attachmentId.thumbnail";
import { loader as testPageLoader } from "~/routes/foam-systems.$systemId.tests.$testId";
import { loader as recordPdfLoader } from "~/routes/foam-systems.$systemId.tests.$testId.record-pdf";
import {
  action as movementUploadAction,
  loader as movementListLoader,
} from "~/routes/api.stock.movements.$movementId.attachments";
import {
  action as movementRemoveAction,
  loader as movementFileLoader,
} from "~/routes/stock.movements.$movementId.attachments.$attachmentId";
import { loader as movementsPageLoader } from "~/routes/stock.movements";
import { action as eventUploadAction } from "~/routes/api.events.$id.attachments";
import { loader as editLoader } from "~/routes/events.$id.edit";
import { demoDocumentPdf, demoPhotoJpeg } from "../../scripts/demo-files";
import { makeSystemWithFlowTest } from "../support/catalogue-factories";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { startFileStore } from "../support/file-store";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeEvent, makeProduct, makeStation } from "../support/usage-fixtures";

const ORIGIN = "http://127.0.0.1:3000";
let closeFileStore: () => Promise<void>;
let officer: { id: number; cookie: string };
let environmental: { id: number; cookie: string };
let clerk: { id: number; cookie: string };
let systemId: number;
let testId: number;
let disposedId: number;
let receivedId: number;

async function person(roles: Parameters<typeof makeUser>[0], name: string) {
  const user = await makeUser(roles, name, { stationId: null });
  return { id: user.id, cookie: await signIn(user.email, TEST_PASSWORD, "10.16.0.1") };
}

function uploadRequest(
  path: string,
  file: { bytes: Uint8Array; name: string; type: string },
  cookie: string,
  fields: Record<string, string> = {},
): Request {
  const form = new FormData();
  for (const [key, value] of Object.entries(fields)) form.append(key, value);
  form.append("file", new Blob([new Uint8Array(file.bytes)], { type: file.type }), file.name);
  return new Request(`${ORIGIN}${path}`, { method: "POST", body: form, headers: { Origin: ORIGIN, Cookie: cookie } });
}

const statusOf = (outcome: { value: unknown }) =>
  outcome.value instanceof Response
    ? outcome.value.status
    : ((outcome.value as { init?: { status: number }; status?: number }).init?.status ??
      (outcome.value as { status: number }).status);

async function pdfText(bytes: Uint8Array): Promise<string> {
  const parser = new PDFParse({ data: Buffer.from(bytes) });
  try {
    return (await parser.getText()).text;
  } finally {
    await parser.destroy();
  }
}

const printout = () => ({
  bytes: demoDocumentPdf("Refractometer printout (test)", ["Sample 1: 3.1 %"]),
  name: "refractometer-printout.pdf",
  type: "application/pdf",
});

beforeAll(async () => {
  closeFileStore = await startFileStore("owner-attachments");
  await ensureAgency(db, { attachment_max_mb: 25, attachments_per_event: 40, attachment_retention_days: 1095 });
  officer = await person(["officer"], "Printout Officer");
  environmental = await person(["environmental"], "Manifest Keeper");
  clerk = await person(["records"], "Records Clerk");

  ({ systemId, testId } = await makeSystemWithFlowTest("Printout system", officer.id));

  const station = (await makeStation()).id;
  const product = (await makeProduct({ foamClass: "B", foamType: "f3" })).id;
  const [locationId] = await db("stock_locations").insert({
    kind: "station_store",
    name: `Manifest store ${Date.now()}`,
    station_id: station,
  });
  [receivedId] = await db("stock_movements").insert({
    kind: "received",
    location_id: locationId,
    product_id: product,
    gal: 55,
    at: new Date("2026-03-01T10:00:00Z"),
  });
  [disposedId] = await db("stock_movements").insert({
    kind: "disposed",
    location_id: locationId,
    product_id: product,
    gal: -20,
    at: new Date("2026-03-02T10:00:00Z"),
    reason: "Past its shelf life",
    reference: "HAUL-0001 (test)",
  });
});

afterAll(async () => {
  await closeFileStore();
});

describe("printouts on an accuracy test", () => {
  const path = () => `/api/foam-tests/${testId}/attachments`;
  const send = (cookie: string, file = printout(), fields: Record<string, string> = {}) =>
    settle(() => testUploadAction(routeArgs(uploadRequest(path(), file, cookie, fields), { testId: String(testId) })));

  it("are attached by who maintains systems, listed, served, named in the test record and removed with an audit entry", async () => {
    // Environmental reads the fleet but does not maintain it.
    expect(statusOf(await send(environmental.cookie))).toBe(403);
    // The records clerk does not read the fleet at all.
    const clerkList = await settle(() =>
      testListLoader(routeArgs(getRequest(path(), { Cookie: clerk.cookie }), { testId: String(testId) })),
    );
    expect(statusOf(clerkList)).toBe(403);
    // A test takes printouts only.
    const wrongKind = await send(officer.cookie, printout(), { kind: "photo" });
    expect(statusOf(wrongKind)).toBe(400);
    expect(await (wrongKind.value as Response).json()).toMatchObject({
      error: expect.stringContaining("test_printout"),
    });

    const created = (await send(officer.cookie)).value as Response;
    expect(created.status).toBe(201);
    const attachment = await created.json();
    expect(attachment).toMatchObject({
      kind: "test_printout",
      name: "refractometer-printout.pdf",
      contentType: "application/pdf",
      url: `/foam-tests/${testId}/attachments/${attachment.id}`,
      thumbnailUrl: null,
    });
    const row = await db("attachments").where({ id: attachment.id }).first();
    expect(row).toMatchObject({ subject: "foam_test", subject_id: testId });
    expect(row.storage_key).toMatch(new RegExp(`^attachments/foam-test-${testId}/[0-9a-f-]{36}\\.pdf$`));
    expect(new Uint8Array((await getObject(row.storage_key)).body)).toEqual(printout().bytes);

    // Who reads the fleet sees it, without the right to attach.
    const list = (await testListLoader(
      routeArgs(getRequest(path(), { Cookie: environmental.cookie }), { testId: String(testId) }),
    )) as Response;
    const listed = await list.json();
    expect(listed).toMatchObject({ canAttach: false, kinds: ["test_printout"] });
    expect(listed.attachments.map((item: { id: number }) => item.id)).toEqual([attachment.id]);

    const params = { testId: String(testId), attachmentId: String(attachment.id) };
    const file = (await testFileLoader(
      routeArgs(getRequest(attachment.url, { Cookie: environmental.cookie }), params),
    )) as Response;
    expect(file.headers.get("Content-Disposition")).toMatch(/^attachment;/);
    expect(new Uint8Array(await file.arrayBuffer())).toEqual(printout().bytes);
    const download = await db("audit_events")
      .where({ action: "attachment_downloaded", actor_user_id: environmental.id })
      .first();
    expect(download).toMatchObject({ entity_type: "foam_accuracy_test", entity_id: String(testId) });
    // Another test's address does not serve it.
    const elsewhere = await settle(() =>
      testFileLoader(
        routeArgs(getRequest(attachment.url, { Cookie: officer.cookie }), { ...params, testId: String(testId + 1) }),
      ),
    );
    expect(statusOf(elsewhere)).toBe(404);
    // A PDF has no thumbnail.
    expect(
      statusOf(
        await settle(() =>
          testThumbnailLoader(routeArgs(getRequest(`${attachment.url}/thumbnail`, { Cookie: officer.cookie }), params)),
        ),
      ),
    ).toBe(404);

    const page = await testPageLoader(
      routeArgs(getRequest(`/foam-systems/${systemId}/tests/${testId}`, { Cookie: environmental.cookie }), {
        systemId: String(systemId),
        testId: String(testId),
      }),
    );
    expect(page.test.id).toBe(testId);

    const pdf = (await recordPdfLoader(
      routeArgs(getRequest(`/foam-systems/${systemId}/tests/${testId}/record.pdf`, { Cookie: officer.cookie }), {
        systemId: String(systemId),
        testId: String(testId),
      }),
    )) as Response;
    const text = await pdfText(new Uint8Array(await pdf.arrayBuffer()));
    expect(text).toContain("Attached printouts");
    expect(text).toContain("refractometer-printout.pdf");

    // Removal: not by who only reads, then audited for who maintains.
    const refused = await settle(() =>
      testRemoveAction(
        routeArgs(formRequest(attachment.url, { intent: "remove" }, { Cookie: environmental.cookie }), params),
      ),
    );
    expect(statusOf(refused)).toBe(403);
    await testRemoveAction(
      routeArgs(formRequest(attachment.url, { intent: "remove" }, { Cookie: officer.cookie }), params),
    );
    const audit = await db("audit_events")
      .where({ action: "attachment_removed", entity_type: "foam_accuracy_test", entity_id: String(testId) })
      .first();
    expect(audit).toMatchObject({ actor_user_id: officer.id });
    expect(JSON.parse(audit.before_json)).toMatchObject({ attachmentId: attachment.id, sha256: row.sha256 });
    const after = (await testListLoader(
      routeArgs(getRequest(path(), { Cookie: officer.cookie }), { testId: String(testId) }),
    )) as Response;
    expect((await after.json()).attachments).toEqual([]);
    // The file stays in the store until the retention setting lets it go.
    expect((await getObject(row.storage_key)).body.byteLength).toBeGreaterThan(0);
    const reprinted = (await recordPdfLoader(
      routeArgs(getRequest(`/foam-systems/${systemId}/tests/${testId}/record.pdf`, { Cookie: officer.cookie }), {
        systemId: String(systemId),
        testId: String(testId),
      }),
    )) as Response;
    expect(await pdfText(new Uint8Array(await reprinted.arrayBuffer()))).toContain("None attached.");
  });

  it("are refused for a test that does not exist, and a photographed printout gets a thumbnail", async () => {
    const missing = await settle(() =>
      testUploadAction(
        routeArgs(uploadRequest(`/api/foam-tests/999999/attachments`, printout(), officer.cookie), {
          testId: "999999",
        }),
      ),
    );
    expect(statusOf(missing)).toBe(404);
    const photo = { bytes: await demoPhotoJpeg({ label: "Printout photo" }), name: "printout.jpg", type: "image/jpeg" };
    const created = (await send(officer.cookie, photo)).value as Response;
    expect(created.status).toBe(201);
    const attachment = await created.json();
    expect(attachment).toMatchObject({ kind: "test_printout", contentType: "image/jpeg" });
    const thumbnail = (await testThumbnailLoader(
      routeArgs(getRequest(attachment.thumbnailUrl, { Cookie: officer.cookie }), {
        testId: String(testId),
        attachmentId: String(attachment.id),
      }),
    )) as Response;
    expect(thumbnail.headers.get("Content-Type")).toBe("image/webp");
  });
});

describe("a manifest on a disposal", () => {
  const manifest = () => ({
    bytes: demoDocumentPdf("Hauler's manifest (test)", ["20 gal concentrate collected"]),
    name: "manifest HAUL-0001.pdf",
    type: "application/pdf",
  });
  const path = (id: number) => `/api/stock/movements/${id}/attachments`;
  const send = (cookie: string, id = disposedId) =>
    settle(() =>
      movementUploadAction(routeArgs(uploadRequest(path(id), manifest(), cookie), { movementId: String(id) })),
    );

  it("is attached by who manages stock, listed with the movement, served and removed with an audit entry", async () => {
    // An officer reads the stock book but does not manage it; the clerk does not read it.
    expect(statusOf(await send(officer.cookie))).toBe(403);
    expect(
      statusOf(
        await settle(() =>
          movementListLoader(
            routeArgs(getRequest(path(disposedId), { Cookie: clerk.cookie }), { movementId: String(disposedId) }),
          ),
        ),
      ),
    ).toBe(403);
    // Only a disposal takes a manifest.
    expect(statusOf(await send(environmental.cookie, receivedId))).toBe(404);

    const created = (await send(environmental.cookie)).value as Response;
    expect(created.status).toBe(201);
    const attachment = await created.json();
    expect(attachment).toMatchObject({
      kind: "disposal_manifest",
      name: "manifest HAUL-0001.pdf",
      url: `/stock/movements/${disposedId}/attachments/${attachment.id}`,
    });
    const row = await db("attachments").where({ id: attachment.id }).first();
    expect(row.storage_key).toMatch(new RegExp(`^attachments/stock-movement-${disposedId}/`));

    const list = (await movementListLoader(
      routeArgs(getRequest(path(disposedId), { Cookie: officer.cookie }), { movementId: String(disposedId) }),
    )) as Response;
    const listed = await list.json();
    expect(listed).toMatchObject({ canAttach: false, kinds: ["disposal_manifest"] });
    expect(listed.attachments.map((item: { id: number }) => item.id)).toEqual([attachment.id]);

    const page = await movementsPageLoader(routeArgs(getRequest("/stock/movements", { Cookie: officer.cookie })));
    const shown = page.movements.find((movement) => movement.id === disposedId);
    expect(shown?.manifests).toEqual([{ id: attachment.id, name: attachment.name, url: attachment.url }]);
    expect(page.movements.find((movement) => movement.id === receivedId)?.manifests).toEqual([]);

    const params = { movementId: String(disposedId), attachmentId: String(attachment.id) };
    const file = (await movementFileLoader(
      routeArgs(getRequest(attachment.url, { Cookie: officer.cookie }), params),
    )) as Response;
    expect(new Uint8Array(await file.arrayBuffer())).toEqual(manifest().bytes);
    // The name is escaped in the header: its space cannot split the parameter.
    expect(file.headers.get("Content-Disposition")).not.toContain("filename=manifest HAUL");

    expect(
      statusOf(
        await settle(() =>
          movementRemoveAction(
            routeArgs(formRequest(attachment.url, { intent: "remove" }, { Cookie: officer.cookie }), params),
          ),
        ),
      ),
    ).toBe(403);
    await movementRemoveAction(
      routeArgs(formRequest(attachment.url, { intent: "remove" }, { Cookie: environmental.cookie }), params),
    );
    const audit = await db("audit_events")
      .where({ action: "attachment_removed", entity_type: "stock_movement", entity_id: String(disposedId) })
      .first();
    expect(audit).toMatchObject({ actor_user_id: environmental.id });
    const gone = await settle(() =>
      movementFileLoader(routeArgs(getRequest(attachment.url, { Cookie: officer.cookie }), params)),
    );
    expect(statusOf(gone)).toBe(404);
  });
});

describe("a photo's kept position on the report's edit page", () => {
  it("is offered for the photos whose position the officer kept, and for no other", async () => {
    const station = (await makeStation()).id;
    const user = await makeUser(["officer"], "Position Officer", { stationId: station });
    const cookie = await signIn(user.email, TEST_PASSWORD, "10.16.0.2");
    const eventId = (
      await makeEvent({ createdBy: user.id, status: "draft", stationId: station, startedAt: new Date() })
    ).id;
    const photo = () =>
      demoPhotoJpeg({
        label: "Runoff at the swale",
        exif: { latitude: 38.7131, longitude: -98.2011, camera: "Cam 9" },
      });
    const path = `/api/events/${eventId}/attachments`;
    const send = async (name: string, fields: Record<string, string>) => {
      const bytes = await photo();
      const outcome = await settle(() =>
        eventUploadAction(
          routeArgs(uploadRequest(path, { bytes, name, type: "image/jpeg" }, cookie, fields), {
            id: String(eventId),
          }),
        ),
      );
      const response = outcome.value as Response;
      expect(response.status).toBe(201);
      return (await response.json()) as { id: number };
    };
    const kept = await send("kept.jpg", { usePosition: "true" });
    await send("stripped.jpg", {});

    const page = await editLoader(
      routeArgs(getRequest(`/events/${eventId}/edit`, { Cookie: cookie }), { id: String(eventId) }),
    );
    expect(page.photoPositions).toHaveLength(1);
    expect(page.photoPositions[0]).toMatchObject({ id: kept.id, name: "kept.jpg" });
    expect(page.photoPositions[0].latitude).toBeCloseTo(38.7131, 3);
    expect(page.photoPositions[0].longitude).toBeCloseTo(-98.2011, 3);
    // Offering it changes nothing: the report keeps its own point until the officer saves.
    const event = await db("events").where({ id: eventId }).first();
    expect(event.latitude).toBeNull();
  });
});
