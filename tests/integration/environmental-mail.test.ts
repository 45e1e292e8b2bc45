import { createHash } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import { createServer, type AddressInfo } from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { deliverPendingMail, MAX_ATTEMPTS, retryMailNow } from "~/models/mail-outbox.server";
import {
  queueFiledReportAlerts,
  queueQuarterlyWorkbookMail,
  queueReturnedReportNotice,
} from "~/models/report-notifications.server";
import { startFakeSmtp, type FakeSmtp } from "../../scripts/fake-smtp";
import { makeUser } from "../support/factories";
import { ensureAgency, makeEvent, makeProduct } from "../support/usage-fixtures";

let smtp: FakeSmtp;
let smtpUrl: string;
let dir: string;

/** A loopback port with nothing listening on it: sends there fail with ECONNREFUSED. */
async function closedPort(): Promise<number> {
  const server = createServer();
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", () => resolve()));
  const { port } = server.address() as AddressInfo;
  await new Promise<void>((resolve) => server.close(() => resolve()));
  return port;
}

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), "foamtally-mail-"));
  smtp = await startFakeSmtp({ port: 0, directory: dir });
  smtpUrl = `smtp://127.0.0.1:${smtp.port}`;
  await ensureAgency(db, {
    release_alert_recipients: "release-desk@test.example",
    report_recipients: "quarterly-desk@test.example, county-desk@test.example",
  });
});

afterAll(async () => {
  await smtp.close();
  rmSync(dir, { recursive: true, force: true });
});

async function messagesTo(address: string) {
  return (await smtp.messages()).filter((message) => message.envelopeTo.includes(address));
}

describe("release alerts and notices by e-mail", () => {
  it("alerts on a filed report with legacy AR-AFFF to a storm drain, with the link and figures", async () => {
    const officer = await makeUser(["officer"], "Alert Officer");
    const enviro = await makeUser(["environmental"], "Alert Reviewer");
    const legacy = await makeProduct({
      foamClass: "B",
      foamType: "ar-afff",
      pfasContaining: true,
      pfasContent: 10,
      pfasContentUnit: "g_per_l",
      pfasContentSource: "middle of 5–15 g/L for legacy PFOS AFFF (an old product safety sheet)",
    });
    const event = await makeEvent({
      createdBy: officer.id,
      status: "filed",
      startedAt: new Date("2032-03-03T15:00:00Z"),
      discharges: [
        {
          productId: legacy.id,
          percent: 3,
          flowBasis: "solution",
          flow: 200,
          minutes: 15,
          water: 2910,
          concentrate: 90,
        },
      ],
      dispositions: [{ disposition: "storm_drain", sharePercent: 100, receivingWater: "Test Creek" }],
      pfasContaining: true,
    });
    await db.transaction((trx) => queueFiledReportAlerts(event.id, trx));
    expect(await deliverPendingMail({ smtpUrl })).toMatchObject({ sent: expect.any(Number), retrying: 0 });

    const [alert] = await messagesTo("release-desk@test.example");
    expect(alert.subject).toBe(
      `Release alert: report ${event.number} — PFAS-containing foam and runoff to a drain or water`,
    );
    expect(alert.envelopeTo).toContain(enviro.email);
    expect(alert.text).toContain(`/events/${event.id}`);
    expect(alert.text).toContain("Concentrate: 90 US gal (340.7 L)");
    expect(alert.text).toContain("Foam solution: 3,000 US gal");
    // 90 gal × 3.785411784 L/gal (NIST Handbook 44) × 10 g/L (the content set above) = 3,406.87 g = 7.511 lb
    // (1 lb = 453.59237 g, NIST Handbook 44), all of it released to the storm drain.
    expect(alert.text).toContain("estimated PFAS released 3,406.9 g (7.511 lb)");
    expect(alert.text).toContain("To a storm drain: 3,000 US gal (11,356.2 L) to Test Creek");
    expect(alert.text).toContain("This report alone reaches it.");
    // 40 CFR 302.6(a), 355.40: notice is due immediately; a record kept afterwards is not one.
    expect(alert.text).toContain("not a notification to any authority");
    expect(alert.text).toContain("reported immediately");
    expect(alert.text).not.toMatch(/within days/);
    const row = await db("mail_outbox").where({ event_id: event.id }).first();
    expect(row).toMatchObject({ kind: "release_alert", status: "sent", attempts: 1 });
  });

  it("says UNKNOWN, never no, for PFAS foam whose content is not recorded (mixture rule, 40 CFR 302.6(b)(1)(ii))", async () => {
    const officer = await makeUser(["officer"], "Unknown Officer");
    const product = await makeProduct({ foamClass: "B", foamType: "afff", pfasContaining: true });
    const event = await makeEvent({
      createdBy: officer.id,
      status: "filed",
      startedAt: new Date("2032-03-05T15:00:00Z"),
      discharges: [{ productId: product.id, percent: 3, water: 97, concentrate: 3 }],
      dispositions: [{ disposition: "soil", sharePercent: 100 }],
      pfasContaining: true,
    });
    await db.transaction((trx) => queueFiledReportAlerts(event.id, trx));
    const row = await db("mail_outbox").where({ event_id: event.id, kind: "release_alert" }).first();
    expect(row.text_body).toMatch(/reportable quantity is reached is UNKNOWN/);
    expect(row.text_body).toMatch(/Reportable quantity reached: UNKNOWN/);
  });

  it("names the foam solution no runoff line accounts for (issue 10 §4: runoff that does not add up)", async () => {
    const officer = await makeUser(["officer"], "Short Runoff Officer");
    const product = await makeProduct({ foamClass: "B", foamType: "afff", pfasContaining: true });
    // 970 gal water + 30 gal concentrate = 1,000 gal of solution; 300 contained + 20 % (200) to a
    // storm drain leaves 500 gal unaccounted (1,892.7 L at 3.785411784 L per US gal).
    const event = await makeEvent({
      createdBy: officer.id,
      status: "filed",
      startedAt: new Date("2032-03-06T15:00:00Z"),
      discharges: [{ productId: product.id, percent: 3, water: 970, concentrate: 30 }],
      dispositions: [
        { disposition: "contained", volumeGal: 300, disposalReference: "Drum M-1" },
        { disposition: "storm_drain", sharePercent: 20, receivingWater: "Mail Creek" },
      ],
      pfasContaining: true,
    });
    await db.transaction((trx) => queueFiledReportAlerts(event.id, trx));
    const row = await db("mail_outbox").where({ event_id: event.id, kind: "release_alert" }).first();
    expect(row.text_body).toMatch(/^- Unaccounted \(no runoff line says where it went\): 500 US gal \(1,892\.7 L\)$/m);
  });

  it("sends the release alert to the chief as well while the setting says so (issue 10 §2)", async () => {
    const officer = await makeUser(["officer"], "Chief Alert Officer");
    const chief = await makeUser(["chief"], "Alerted Chief");
    const product = await makeProduct({ foamClass: "B", foamType: "afff", pfasContaining: true });
    const alertFor = async (startedAt: string) => {
      const event = await makeEvent({
        createdBy: officer.id,
        status: "filed",
        startedAt: new Date(startedAt),
        discharges: [{ productId: product.id, percent: 3, water: 97, concentrate: 3 }],
        dispositions: [{ disposition: "soil", sharePercent: 100 }],
        pfasContaining: true,
      });
      await db.transaction((trx) => queueFiledReportAlerts(event.id, trx));
      const row = await db("mail_outbox").where({ event_id: event.id, kind: "release_alert" }).first();
      return String(row.to_addresses);
    };
    await db("agency_settings").where({ id: 1 }).update({ release_alerts_to_chief: true });
    expect(await alertFor("2032-03-07T15:00:00Z")).toContain(chief.email);
    await db("agency_settings").where({ id: 1 }).update({ release_alerts_to_chief: false });
    try {
      expect(await alertFor("2032-03-08T15:00:00Z")).not.toContain(chief.email);
    } finally {
      await db("agency_settings").where({ id: 1 }).update({ release_alerts_to_chief: true });
    }
  });

  it("sends nothing for a report without PFAS foam whose runoff was contained", async () => {
    const officer = await makeUser(["officer"]);
    const classA = await makeProduct({ foamClass: "A" });
    const event = await makeEvent({
      createdBy: officer.id,
      status: "filed",
      startedAt: new Date("2032-03-04T15:00:00Z"),
      discharges: [{ productId: classA.id, percent: 0.3, water: 1000, concentrate: 3 }],
      dispositions: [{ disposition: "contained", sharePercent: 100, disposalReference: "Pad 1" }],
    });
    await db.transaction((trx) => queueFiledReportAlerts(event.id, trx));
    expect(await db("mail_outbox").where({ event_id: event.id }).count({ n: "*" }).first()).toMatchObject({ n: 0 });
  });

  it("sends the reviewer's comment of a returned report to its officer", async () => {
    const officer = await makeUser(["officer"], "Returned Officer");
    const event = await makeEvent({
      createdBy: officer.id,
      status: "returned",
      startedAt: new Date("2032-03-05T15:00:00Z"),
    });
    await db.transaction((trx) =>
      queueReturnedReportNotice(event.id, "Line 2: the flow looks like solution, not water.", trx),
    );
    await deliverPendingMail({ smtpUrl });
    const [notice] = await messagesTo(officer.email);
    expect(notice.subject).toBe(`Report ${event.number} was returned for changes`);
    expect(notice.text).toContain("Line 2: the flow looks like solution, not water.");
    expect(notice.text).toContain(`/events/${event.id}`);
  });

  it("keeps a message whose send failed, shows the error, retries with backoff and then sends it", async () => {
    const officer = await makeUser(["officer"], "Retry Officer");
    const event = await makeEvent({
      createdBy: officer.id,
      status: "returned",
      startedAt: new Date("2032-03-06T15:00:00Z"),
    });
    await db.transaction((trx) => queueReturnedReportNotice(event.id, "Please add the receiving water.", trx));
    const deadUrl = `smtp://127.0.0.1:${await closedPort()}`;
    const admin = await makeUser(["admin"], "Retry Administrator");
    const actor = { id: admin.id, email: admin.email, clientAddress: null };

    await deliverPendingMail({ smtpUrl: deadUrl });
    let row = await db("mail_outbox").where({ event_id: event.id }).first();
    expect(row).toMatchObject({ status: "queued", attempts: 1 });
    expect(row.last_error).toMatch(/ECONNREFUSED|connect/i);
    // The first retry waits one minute: nothing is due yet.
    const wait = (new Date(row.next_attempt_at).getTime() - Date.now()) / 60_000;
    expect(wait).toBeGreaterThan(0.9);
    expect(wait).toBeLessThan(1.1);
    expect(await db("events").where({ id: event.id }).first()).toMatchObject({ status: "returned" });

    for (let attempt = 2; attempt <= MAX_ATTEMPTS; attempt++) {
      await retryMailNow(row.id, actor);
      await deliverPendingMail({ smtpUrl: deadUrl });
    }
    row = await db("mail_outbox").where({ id: row.id }).first();
    expect(row).toMatchObject({ status: "failed", attempts: MAX_ATTEMPTS });

    expect(await retryMailNow(row.id, actor)).toBe(true);
    await deliverPendingMail({ smtpUrl });
    row = await db("mail_outbox").where({ id: row.id }).first();
    expect(row).toMatchObject({ status: "sent", last_error: null });
    expect((await messagesTo(officer.email)).map((message) => message.subject)).toEqual([
      `Report ${event.number} was returned for changes`,
    ]);
  });

  it("sends the quarterly workbook to the report recipients as an attachment", async () => {
    const sender = await makeUser(["environmental"], "Quarter Sender");
    const content = Buffer.from("PK\u0003\u0004 stand-in workbook bytes");
    const sha256 = createHash("sha256").update(content).digest("hex");
    await db.transaction((trx) =>
      queueQuarterlyWorkbookMail(
        { periodLabel: "2032 Q1", fileName: "foam-runoff-summary_2032-Q1.xlsx", content, sha256, sentBy: sender },
        trx,
      ),
    );
    await deliverPendingMail({ smtpUrl });
    const [message] = await messagesTo("county-desk@test.example");
    expect(message.envelopeTo).toEqual(["quarterly-desk@test.example", "county-desk@test.example"]);
    expect(message.subject).toContain("2032 Q1");
    expect(message.text).toContain(sha256);
    expect(message.attachments).toEqual([
      {
        filename: "foam-runoff-summary_2032-Q1.xlsx",
        contentType: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
        size: content.length,
        sha256,
      },
    ]);
  });
});
