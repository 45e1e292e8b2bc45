// Attachments on events against the object-store fake: upload, list, download, remove, refusals,
// metadata stripping read back with exifr, and who may do what.
import exifr from "exifr";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { env } from "~/lib/env.server";
import { getObject, objectExists, putObject } from "~/lib/storage.server";
import { findOrphanObjects, purgeRemovedAttachments } from "~/models/attachments.server";
import { createRecordsRequest } from "~/models/records-request.server";
import {
  action as requestUploadAction,
  loader as requestListLoader,
} from "~/routes/api.records-requests.$id.attachments";
import {
  action as requestRemoveAction,
  loader as requestFileLoader,
} from "~/routes/records.$id.attachments.$attachmentId";
import { action as uploadAction, loader as listLoader } from "~/routes/api.events.$id.attachments";
import { action as removeAction, loader as fileLoader } from "~/routes/attachments.$id";
import { loader as thumbnailLoader } from "~/routes/attachments.$id.thumbnail";
import { demoDocumentPdf, demoPhotoJpeg } from "../../scripts/demo-files";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { startFileStore } from "../support/file-store";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency, makeEvent, makeStation } from "../support/usage-fixtures";

const ORIGIN = "http://127.0.0.1:3000";
let closeFileStore: () => Promise<void>;
let eventId: number;
let draftId: number;
let officer: { id: number; cookie: string };
let stranger: { id: number; cookie: string };
let adminCookie: string;

async function person(roles: Parameters<typeof makeUser>[0], stationId: number | null) {
  const user = await makeUser(roles, "Attachment Test", { stationId });
  return { id: user.id, cookie: await signIn(user.email, TEST_PASSWORD, "10.13.0.1") };
}

function uploadRequest(
  id: number | string,
  file: { bytes: Uint8Array; name: string; type?: string },
  cookie: string,
  fields: Record<string, string> = {},
  headers: Record<string, string> = {},
): Request {
  const form = new FormData();
  for (const [key, value] of Object.entries(fields)) form.append(key, value);
  form.append("file", new Blob([new Uint8Array(file.bytes)], { type: file.type ?? "image/jpeg" }), file.name);
  const path = typeof id === "number" ? `/api/events/${id}/attachments` : id;
  return new Request(`${ORIGIN}${path}`, {
    method: "POST",
    body: form,
    headers: { Origin: ORIGIN, Cookie: cookie, ...headers },
  });
}

async function upload(...args: Parameters<typeof uploadRequest>): Promise<Response> {
  const outcome = await settle(() => uploadAction(routeArgs(uploadRequest(...args), { id: String(args[0]) })));
  return outcome.value as Response;
}

async function listOf(id: number, cookie: string) {
  const response = (await listLoader(
    routeArgs(getRequest(`/api/events/${id}/attachments`, { Cookie: cookie }), { id: String(id) }),
  )) as Response;
  return (await response.json()) as { attachments: { id: number; name: string }[]; canAttach: boolean };
}

const photoWithPosition = () =>
  demoPhotoJpeg({ label: "Runoff at the inlet", exif: { latitude: 38.7125, longitude: -98.2042, camera: "Cam 9" } });

beforeAll(async () => {
  closeFileStore = await startFileStore("attachments");
  await ensureAgency(db, { attachment_max_mb: 25, attachments_per_event: 40, attachment_retention_days: 1095 });
  const station = (await makeStation()).id;
  officer = await person(["officer"], station);
  stranger = await person(["officer"], (await makeStation()).id);
  adminCookie = (await person(["admin"], null)).cookie;
  eventId = (await makeEvent({ createdBy: officer.id, status: "filed", stationId: station, startedAt: new Date() })).id;
  draftId = (await makeEvent({ createdBy: officer.id, status: "draft", stationId: station, startedAt: new Date() })).id;
});

beforeEach(async () => {
  await ensureAgency(db, { attachment_max_mb: 25, attachments_per_event: 40, attachment_retention_days: 1095 });
});

afterAll(async () => {
  await closeFileStore();
});

describe("an attached photo", () => {
  it("is stored without its location and camera data, with a thumbnail, and listed and served", async () => {
    const original = await photoWithPosition();
    expect(await exifr.gps(original)).toMatchObject({ latitude: expect.closeTo(38.7125, 3) });

    const response = await upload(eventId, { bytes: original, name: "inlet.jpg" }, officer.cookie, { kind: "photo" });
    expect(response.status).toBe(201);
    const created = await response.json();
    expect(created).toMatchObject({
      kind: "photo",
      name: "inlet.jpg",
      contentType: "image/jpeg",
      url: `/attachments/${created.id}`,
      thumbnailUrl: `/attachments/${created.id}/thumbnail`,
      position: null,
    });
    expect(Object.keys(created)).toEqual(
      expect.arrayContaining(["id", "kind", "name", "contentType", "size", "url", "thumbnailUrl"]),
    );

    const row = await db("attachments").where({ id: created.id }).first();
    expect(row.storage_key).toMatch(new RegExp(`^attachments/event-${eventId}/[0-9a-f-]{36}\\.jpg$`));
    const stored = (await getObject(row.storage_key)).body;
    expect(stored.byteLength).toBe(created.size);
    expect(await exifr.gps(Buffer.from(stored))).toBeUndefined();
    const tags = (await exifr.parse(Buffer.from(stored), { tiff: true, exif: true, gps: true, xmp: true })) ?? {};
    expect(tags.Make).toBeUndefined();
    expect(tags.Model).toBeUndefined();
    expect(tags.latitude).toBeUndefined();

    const list = await listOf(eventId, officer.cookie);
    expect(list.canAttach).toBe(true);
    expect(list.attachments.map((item) => item.id)).toContain(created.id);

    const file = (await fileLoader(
      routeArgs(getRequest(created.url, { Cookie: officer.cookie }), { id: String(created.id) }),
    )) as Response;
    expect(file.headers.get("Content-Type")).toBe("image/jpeg");
    expect(new Uint8Array(await file.arrayBuffer())).toEqual(stored);
    const audit = await db("audit_events")
      .where({ action: "attachment_downloaded", actor_user_id: officer.id })
      .first();
    expect(JSON.parse(audit.after_json)).toMatchObject({ attachmentId: created.id, sha256: row.sha256 });

    const thumbnail = (await thumbnailLoader(
      routeArgs(getRequest(created.thumbnailUrl, { Cookie: officer.cookie }), { id: String(created.id) }),
    )) as Response;
    expect(thumbnail.headers.get("Content-Type")).toBe("image/webp");
    const thumbnailBytes = new Uint8Array(await thumbnail.arrayBuffer());
    expect(new TextDecoder().decode(thumbnailBytes.slice(8, 12))).toBe("WEBP");
  });

  it("keeps the photo's position when the officer chooses to use it, read before the data is stripped", async () => {
    const response = await upload(eventId, { bytes: await photoWithPosition(), name: "berm.jpg" }, officer.cookie, {
      usePosition: "true",
    });
    expect(response.status).toBe(201);
    const created = await response.json();
    expect(created.position.latitude).toBeCloseTo(38.7125, 3);
    expect(created.position.longitude).toBeCloseTo(-98.2042, 3);
    const row = await db("attachments").where({ id: created.id }).first();
    expect(await exifr.gps(Buffer.from((await getObject(row.storage_key)).body))).toBeUndefined();
  });

  it("gives a file name back in a Content-Disposition it cannot break", async () => {
    const pdf = demoDocumentPdf("Hauler manifest", ["Manifest 0001 (invented)"]);
    const name = 'manifest"; filename=evil.html\r\nX-Injected: 1.pdf';
    const response = await upload(eventId, { bytes: pdf, name, type: "application/pdf" }, officer.cookie, {
      kind: "disposal_manifest",
    });
    expect(response.status).toBe(201);
    const created = await response.json();
    expect(created).toMatchObject({ kind: "disposal_manifest", contentType: "application/pdf", thumbnailUrl: null });
    const file = (await fileLoader(
      routeArgs(getRequest(created.url, { Cookie: officer.cookie }), { id: String(created.id) }),
    )) as Response;
    const disposition = file.headers.get("Content-Disposition")!;
    expect(disposition.startsWith('attachment; filename="')).toBe(true);
    expect(disposition).not.toMatch(/[\r\n]/);
    expect(disposition.match(/"/g)).toHaveLength(2);
    expect(file.headers.get("X-Injected")).toBeNull();
  });
});

describe("a refused file", () => {
  it("is refused by its content: a program renamed .jpg is 400 and nothing is stored", async () => {
    const program = new Uint8Array(4096);
    program.set(new TextEncoder().encode("MZ"), 0);
    program.set([0x50, 0x45, 0, 0], 0x80);
    new DataView(program.buffer).setUint32(0x3c, 0x80, true);
    const before = await db("attachments").count({ n: "*" });
    const response = await upload(eventId, { bytes: program, name: "photo.jpg" }, officer.cookie);
    expect(response.status).toBe(400);
    expect((await response.json()).error).toMatch(/Attach JPEG, PNG, WebP or HEIC photos and PDF documents/);
    expect(await db("attachments").count({ n: "*" })).toEqual(before);
  });

  it("is refused with the limit stated, from its declared length, before it is read", async () => {
    await ensureAgency(db, { attachment_max_mb: 1 });
    const response = await upload(
      eventId,
      { bytes: new Uint8Array(10), name: "big.jpg" },
      officer.cookie,
      {},
      {
        "Content-Length": String(5 * 1024 * 1024),
      },
    );
    expect(response.status).toBe(413);
    expect((await response.json()).error).toBe("The file is larger than 1 MB, the most the agency settings allow.");
  });

  it("is refused with the limit stated while it streams, when no length was declared", async () => {
    await ensureAgency(db, { attachment_max_mb: 1 });
    const response = await upload(
      eventId,
      { bytes: new Uint8Array(1024 * 1024 + 10), name: "big.jpg" },
      officer.cookie,
    );
    expect(response.status).toBe(413);
    expect((await response.json()).error).toMatch(/larger than 1 MB/);
  });

  it("is refused once the event holds as many files as the settings allow", async () => {
    const full = (await makeEvent({ createdBy: officer.id, status: "filed", startedAt: new Date() })).id;
    await ensureAgency(db, { attachments_per_event: 1 });
    const pdf = { bytes: demoDocumentPdf("Lab result", []), name: "lab.pdf", type: "application/pdf" };
    expect((await upload(full, pdf, officer.cookie)).status).toBe(201);
    const second = await upload(full, pdf, officer.cookie);
    expect(second.status).toBe(413);
    expect((await second.json()).error).toMatch(/already has 1 files/);
  });

  it("is an unknown kind: 400", async () => {
    const response = await upload(eventId, { bytes: await photoWithPosition(), name: "x.jpg" }, officer.cookie, {
      kind: "selfie",
    });
    expect(response.status).toBe(400);
  });
});

describe("who may attach and see attachments", () => {
  it("answers 401 to no one signed in, 403 to a role that may not read reports, 404 for a draft of others", async () => {
    const photo = { bytes: await photoWithPosition(), name: "p.jpg" };
    expect((await upload(eventId, photo, "")).status).toBe(401);
    expect((await upload(eventId, photo, adminCookie)).status).toBe(403);
    expect((await upload(draftId, photo, stranger.cookie)).status).toBe(404);

    const listed = await settle(() =>
      listLoader(
        routeArgs(getRequest(`/api/events/${eventId}/attachments`, { Cookie: adminCookie }), { id: String(eventId) }),
      ),
    );
    expect((listed.value as Response).status).toBe(403);
    const anonymous = await settle(() =>
      listLoader(routeArgs(getRequest(`/api/events/${eventId}/attachments`), { id: String(eventId) })),
    );
    expect((anonymous.value as Response).status).toBe(401);

    const own = await upload(draftId, photo, officer.cookie);
    expect(own.status).toBe(201);
    const { id } = await own.json();
    const hidden = await settle(() =>
      fileLoader(routeArgs(getRequest(`/attachments/${id}`, { Cookie: stranger.cookie }), { id: String(id) })),
    );
    expect((hidden.value as { init: { status: number } }).init.status).toBe(404);
    const forbidden = await settle(() =>
      fileLoader(routeArgs(getRequest(`/attachments/${id}`, { Cookie: adminCookie }), { id: String(id) })),
    );
    expect((forbidden.value as { init: { status: number } }).init.status).toBe(403);
  });
});

describe("a removed attachment", () => {
  it("leaves the list, is audited, and keeps its file until the retention setting allows deletion", async () => {
    const response = await upload(eventId, { bytes: await photoWithPosition(), name: "gone.jpg" }, officer.cookie);
    const { id } = await response.json();
    const row = await db("attachments").where({ id }).first();

    await removeAction(
      routeArgs(formRequest(`/attachments/${id}`, { intent: "remove" }, { Cookie: officer.cookie }), {
        id: String(id),
      }),
    );
    expect((await listOf(eventId, officer.cookie)).attachments.map((item) => item.id)).not.toContain(id);
    const audit = await db("audit_events")
      .where({ action: "attachment_removed", entity_id: String(eventId) })
      .first();
    expect(JSON.parse(audit.before_json)).toMatchObject({ attachmentId: id, sha256: row.sha256 });

    await purgeRemovedAttachments();
    expect(await objectExists(row.storage_key)).toBe(true);

    await ensureAgency(db, { attachment_retention_days: 0 });
    await purgeRemovedAttachments(new Date(Date.now() + 1000));
    expect(await objectExists(row.storage_key)).toBe(false);
    expect(await objectExists(row.thumbnail_key)).toBe(false);
    expect((await db("attachments").where({ id }).first()).purged_at).not.toBeNull();
  });
});

describe("the object store down", () => {
  it("fails the upload clearly with 503 and leaves no row behind", async () => {
    const endpoint = env().S3_ENDPOINT;
    env().S3_ENDPOINT = "http://127.0.0.1:9";
    try {
      const before = await db("attachments").count({ n: "*" });
      const response = await upload(eventId, { bytes: await photoWithPosition(), name: "later.jpg" }, officer.cookie);
      expect(response.status).toBe(503);
      expect((await response.json()).error).toMatch(/not answering.*report is saved.*try the file again/);
      expect(await db("attachments").count({ n: "*" })).toEqual(before);
    } finally {
      env().S3_ENDPOINT = endpoint;
    }
  });
});

describe("the sweep of stored files", () => {
  it("lists an object no row names, once it is old enough, and never one a row names", async () => {
    const response = await upload(eventId, { bytes: await photoWithPosition(), name: "kept.jpg" }, officer.cookie);
    const row = await db("attachments")
      .where({ id: (await response.json()).id })
      .first();
    await putObject(`attachments/event-${eventId}/left-by-a-failed-save.jpg`, new Uint8Array([1, 2, 3]), "image/jpeg");

    const keys = (await findOrphanObjects(new Date(Date.now() + 60_000))).map((orphan) => orphan.key);
    expect(keys).toContain(`attachments/event-${eventId}/left-by-a-failed-save.jpg`);
    expect(keys).not.toContain(row.storage_key);
    expect(keys).not.toContain(row.thumbnail_key);
    // A young object may belong to a save still running.
    expect(await findOrphanObjects(new Date(Date.now() - 60_000))).toEqual([]);
  });
});

describe("documents on a public-records request", () => {
  it("are attached, listed, served and removed by the records clerk, and refused to other roles", async () => {
    const clerk = await person(["records"], null);
    const { id: requestId } = await createRecordsRequest({
      name: "Attachment Requester (test)",
      email: "attachment-requester@test.example",
      description: "Photos of the creek release (test)",
    });
    const path = `/api/records-requests/${requestId}/attachments`;
    const pdf = {
      bytes: demoDocumentPdf("Signed release letter", []),
      name: "release-letter.pdf",
      type: "application/pdf",
    };
    const send = (cookie: string) =>
      settle(() => requestUploadAction(routeArgs(uploadRequest(path, pdf, cookie), { id: String(requestId) })));

    expect(((await send(officer.cookie)).value as Response).status).toBe(403);
    const created = (await send(clerk.cookie)).value as Response;
    expect(created.status).toBe(201);
    const attachment = await created.json();
    expect(attachment).toMatchObject({
      kind: "other",
      name: "release-letter.pdf",
      url: `/records/${requestId}/attachments/${attachment.id}`,
    });
    const row = await db("attachments").where({ id: attachment.id }).first();
    expect(row.storage_key).toMatch(new RegExp(`^attachments/records-request-${requestId}/`));

    const list = (await requestListLoader(
      routeArgs(getRequest(path, { Cookie: clerk.cookie }), { id: String(requestId) }),
    )) as Response;
    expect((await list.json()).attachments.map((item: { id: number }) => item.id)).toEqual([attachment.id]);
    const params = { id: String(requestId), attachmentId: String(attachment.id) };
    const file = (await requestFileLoader(
      routeArgs(getRequest(attachment.url, { Cookie: clerk.cookie }), params),
    )) as Response;
    expect(new Uint8Array(await file.arrayBuffer())).toEqual(pdf.bytes);
    // An event's address does not serve a request's file, nor the other way round.
    const viaEvents = await settle(() =>
      fileLoader(
        routeArgs(getRequest(`/attachments/${attachment.id}`, { Cookie: officer.cookie }), {
          id: String(attachment.id),
        }),
      ),
    );
    expect((viaEvents.value as { init: { status: number } }).init.status).toBe(404);

    await requestRemoveAction(
      routeArgs(formRequest(attachment.url, { intent: "remove" }, { Cookie: clerk.cookie }), params),
    );
    const audit = await db("audit_events")
      .where({ action: "attachment_removed", entity_type: "records_request", entity_id: String(requestId) })
      .first();
    expect(audit).toBeTruthy();
  });
});
