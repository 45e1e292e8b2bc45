import { randomUUID } from "node:crypto";
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { recomputeAllEventGeography, recomputeEventGeography, replaceLayer } from "~/models/geography.server";
import { readAgencySettings } from "~/models/agency-settings.server";
import { createRecordsRequest } from "~/models/records-request.server";
import { action, loader } from "~/routes/admin.settings";
import { makeUser } from "../support/factories";
import { formRequest, getRequest, routeArgs, settle } from "../support/requests";
import { ensureAgency } from "../support/usage-fixtures";
import { signIn } from "../support/session";

let admin: string;
let chief: string;
let officer: string;
let adminId: number;
let eventId: number;
let savedRow: Record<string, unknown>;

type Reply = { error?: Record<string, string[] | null> | null };
type ActionData = { result: Reply; conflict: { version: string; name: string } | null };

function outcomeOf(value: unknown): { status: number; data?: ActionData; location?: string | null } {
  if (value instanceof Response) return { status: value.status, location: value.headers.get("Location") };
  const result = value as { data: ActionData; init: { status: number } | null };
  return { status: result.init?.status ?? 200, data: result.data };
}

async function post(cookie: string, fields: Record<string, string>) {
  const request = formRequest("/admin/settings", fields, { Cookie: cookie, "x-foamtally-client-address": "10.7.0.9" });
  return outcomeOf((await settle(() => action(routeArgs(request)))).value);
}

/** A complete, valid form as the page would send it, with the stored version. */
async function validForm(overrides: Record<string, string> = {}): Promise<Record<string, string>> {
  const current = await readAgencySettings();
  return {
    version: current.version,
    name: "Settings Test Fire District (test)",
    timeZone: "America/Denver",
    displayUnits: "us",
    waterwayBufferM: "91.44",
    drawdownTolerancePercent: "15",
    pfasReportableLb: "1",
    classAAccuracyPercent: "30",
    reportRecipients: "quarterly-desk@test.example",
    releaseAlertRecipients: "release-desk@test.example",
    recordsDueRule: "federal",
    recordsOfficeCloses: "17:00",
    recordsClosureDays: "",
    recordsWithholdingRule: "the exemptions of the State Public Records Act (test)",
    releaseAlertsToChief: "on",
    ...overrides,
  };
}

const settingsAudits = () => db("audit_events").where({ action: "agency_settings_updated" }).count({ n: "*" });

beforeAll(async () => {
  await ensureAgency();
  savedRow = await db("agency_settings").where({ id: 1 }).first();
  if (!(await db("geo_layers").where({ kind: "waterways" }).first("id"))) {
    const text = readFileSync("tiles/sources/alder-bend/waterways.geojson", "utf8");
    const result = await replaceLayer({ kind: "waterways", text, fileName: "waterways.geojson" }, null, null, {
      recheckEvents: false,
      keepFile: false,
    });
    expect(result.ok).toBe(true);
  }
  const people = {
    admin: await makeUser(["admin"]),
    chief: await makeUser(["chief"]),
    officer: await makeUser(["officer"]),
  };
  adminId = people.admin.id;
  admin = await signIn(people.admin.email, people.admin.password, "10.7.0.1");
  chief = await signIn(people.chief.email, people.chief.password, "10.7.0.2");
  officer = await signIn(people.officer.email, people.officer.password, "10.7.0.3");
  // Invented event by Station 1 of the demo geography, about 200–225 m from Alder Creek.
  [eventId] = await db("events").insert({
    number: `SET-${randomUUID().slice(0, 8)}`,
    kind: "training",
    status: "filed",
    started_at: new Date("2018-06-10T15:00:00Z"),
    latitude: 38.7,
    longitude: -98.2,
    created_by: people.officer.id,
    water_gal: 100,
    concentrate_gal: 0.3,
    solution_gal: 100.3,
  });
});

afterAll(async () => {
  const { id: _id, ...values } = savedRow;
  await db("agency_settings").where({ id: 1 }).update(values);
  await recomputeAllEventGeography();
});

describe("agency settings page", () => {
  it("shows the settings to an administrator (editable) and to the chief (read only)", async () => {
    const asAdmin = await loader(routeArgs(getRequest("/admin/settings", { Cookie: admin })));
    expect(asAdmin.canEdit).toBe(true);
    expect(asAdmin.settings.version).toMatch(/^[0-9a-f]{24}$/);
    expect(asAdmin.timeZones).toContain("America/Chicago");
    const asChief = await loader(routeArgs(getRequest("/admin/settings", { Cookie: chief })));
    expect(asChief.canEdit).toBe(false);
    expect(asChief.settings).toEqual(asAdmin.settings);
  });

  it("refuses an officer the page and every role but administrator the save (403)", async () => {
    const page = await settle(() => loader(routeArgs(getRequest("/admin/settings", { Cookie: officer }))));
    expect((page.value as { init: { status: number } }).init.status).toBe(403);
    const before = await db("agency_settings").where({ id: 1 }).first();
    for (const cookie of [officer, chief]) {
      const saved = await post(cookie, await validForm({ name: "Not allowed (test)" }));
      expect(saved.status).toBe(403);
    }
    expect(await db("agency_settings").where({ id: 1 }).first()).toEqual(before);
  });

  it("saves every field in one go and records before and after in the audit log", async () => {
    const [{ n: auditsBefore }] = await settingsAudits();
    const before = await readAgencySettings();
    const saved = await post(
      admin,
      await validForm({
        drawdownTolerancePercent: "12.5",
        pfasReportableLb: "0.5",
        classAAccuracyPercent: "20",
        displayUnits: "metric",
        reportRecipients: "Desk-One@test.example\nDesk-Two@test.example, desk-one@test.example",
      }),
    );
    expect(saved).toEqual({ status: 302, location: "/admin/settings" });
    const row = await db("agency_settings").where({ id: 1 }).first();
    expect(row.name).toBe("Settings Test Fire District (test)");
    expect(row.time_zone).toBe("America/Denver");
    expect(row.display_units).toBe("metric");
    expect(Number(row.drawdown_tolerance_share)).toBe(0.125);
    expect(Number(row.pfas_reportable_lb)).toBe(0.5);
    expect(Number(row.class_a_accuracy_share)).toBe(0.2);
    // Lower-cased and without repeats, in the comma-separated form the mailers read.
    expect(row.report_recipients).toBe("desk-one@test.example, desk-two@test.example");
    expect(row.release_alert_recipients).toBe("release-desk@test.example");

    const [{ n: auditsAfter }] = await settingsAudits();
    expect(Number(auditsAfter)).toBe(Number(auditsBefore) + 1);
    const audit = await db("audit_events").where({ action: "agency_settings_updated" }).orderBy("id", "desc").first();
    expect(audit.actor_user_id).toBe(adminId);
    expect(audit.entity_type).toBe("agency_settings");
    expect(audit.client_address).toBe("10.7.0.9");
    expect(JSON.parse(audit.before_json).name).toBe(before.name);
    const after = JSON.parse(audit.after_json);
    expect(after.drawdownToleranceShare).toBe(0.125);
    expect(after.reportRecipients).toEqual(["desk-one@test.example", "desk-two@test.example"]);
  });

  it("puts every error at its field, names the bad address and writes nothing", async () => {
    const before = await db("agency_settings").where({ id: 1 }).first();
    const [{ n: auditsBefore }] = await settingsAudits();
    const refused = await post(
      admin,
      await validForm({
        name: "  ",
        timeZone: "Mars/Olympus_Mons",
        displayUnits: "cubits",
        waterwayBufferM: "-5",
        drawdownTolerancePercent: "abc",
        pfasReportableLb: "0",
        classAAccuracyPercent: "150",
        reportRecipients: "good@test.example, not-an-address",
        releaseAlertRecipients: "alerts@test.example; bad@",
        recordsDueRule: "atlantis",
        recordsOfficeCloses: "25:00",
        recordsClosureDays: "2026-12-24\n2026-12-32",
        recordsWithholdingRule: "",
      }),
    );
    expect(refused.status).toBe(400);
    const errors = refused.data?.result.error ?? {};
    expect(Object.keys(errors).sort()).toEqual(
      [
        "classAAccuracyPercent",
        "displayUnits",
        "drawdownTolerancePercent",
        "name",
        "pfasReportableLb",
        "recordsClosureDays",
        "recordsDueRule",
        "recordsOfficeCloses",
        "recordsWithholdingRule",
        "releaseAlertRecipients",
        "reportRecipients",
        "timeZone",
        "waterwayBufferM",
      ].sort(),
    );
    expect(errors.reportRecipients).toEqual(["“not-an-address” is not an e-mail address."]);
    expect(errors.releaseAlertRecipients).toEqual(["“bad@” is not an e-mail address."]);
    expect(errors.timeZone?.[0]).toMatch(/Not a known time zone/);
    expect(errors.recordsClosureDays).toEqual(["“2026-12-32” is not a date written YYYY-MM-DD."]);
    expect(errors.recordsDueRule).toEqual(["Choose one of the rules listed."]);
    expect(await db("agency_settings").where({ id: 1 }).first()).toEqual(before);
    const [{ n: auditsAfter }] = await settingsAudits();
    expect(Number(auditsAfter)).toBe(Number(auditsBefore));
  });

  it("answers a second save from the same starting point with a conflict and keeps the first", async () => {
    const first = await validForm({ name: "First admin's name (test)" });
    const second = { ...first, name: "Second admin's name (test)", pfasReportableLb: "2" };
    expect((await post(admin, first)).status).toBe(302);
    const [{ n: auditsBefore }] = await settingsAudits();
    const conflict = await post(admin, second);
    expect(conflict.status).toBe(409);
    expect(conflict.data?.result.error?.[""]?.[0]).toMatch(/Someone else saved the agency settings/);
    expect(conflict.data?.conflict?.name).toBe("First admin's name (test)");
    const row = await db("agency_settings").where({ id: 1 }).first();
    expect(row.name).toBe("First admin's name (test)");
    expect(Number(row.pfas_reportable_lb)).toBe(1);
    const [{ n: auditsAfter }] = await settingsAudits();
    expect(Number(auditsAfter)).toBe(Number(auditsBefore));
    // With the version the conflict answer carries, the second save goes through.
    expect((await post(admin, { ...second, version: conflict.data!.conflict!.version })).status).toBe(302);
    expect((await db("agency_settings").where({ id: 1 }).first()).name).toBe("Second admin's name (test)");
  });

  it("saves the incident number prefix in capitals, shows it, and refuses a fixed series at the field", async () => {
    const saved = await post(admin, await validForm({ eventNumberPrefix: "nv" }));
    expect(saved.status).toBe(302);
    expect((await db("agency_settings").where({ id: 1 }).first()).event_number_prefix).toBe("NV");
    expect((await readAgencySettings()).eventNumberPrefix).toBe("NV");
    const refused = await post(admin, await validForm({ eventNumberPrefix: "TR" }));
    expect(refused.status).toBe(400);
    expect((await db("agency_settings").where({ id: 1 }).first()).event_number_prefix).toBe("NV");
    // A form without the field keeps the stored prefix.
    expect((await post(admin, await validForm({ name: "Prefix kept (test)" }))).status).toBe(302);
    expect((await db("agency_settings").where({ id: 1 }).first()).event_number_prefix).toBe("NV");
    await db("agency_settings").where({ id: 1 }).update({ event_number_prefix: "AB" });
  });

  it("rechecks stored events when the waterway buffer changes, in the same save", async () => {
    await post(admin, await validForm({ waterwayBufferM: "91.44" }));
    await recomputeEventGeography(eventId);
    const near = await db("events").where({ id: eventId }).first();
    const distance = Number(near.nearest_waterway_m);
    expect(distance).toBeGreaterThan(150);
    expect(Boolean(near.within_waterway_buffer)).toBe(false);

    const wider = (Math.ceil(distance) + 25).toFixed(2);
    expect((await post(admin, await validForm({ waterwayBufferM: wider }))).status).toBe(302);
    expect(Number((await db("agency_settings").where({ id: 1 }).first()).waterway_buffer_m)).toBe(Number(wider));
    expect(Boolean((await db("events").where({ id: eventId }).first()).within_waterway_buffer)).toBe(true);
    const audit = await db("audit_events").where({ action: "agency_settings_updated" }).orderBy("id", "desc").first();
    expect(audit.summary).toMatch(/waterwayBufferM; rechecked \d+ events/);

    expect((await post(admin, await validForm({ waterwayBufferM: "91.44" }))).status).toBe(302);
    expect(Boolean((await db("events").where({ id: eventId }).first()).within_waterway_buffer)).toBe(false);
  });

  it("keeps the chief among release-alert recipients while ticked and drops them when not (issue 10 §2)", async () => {
    const ticked = await post(admin, await validForm());
    expect(ticked.status).toBe(302);
    expect((await readAgencySettings()).releaseAlertsToChief).toBe(true);
    const form = await validForm();
    delete (form as Record<string, string | undefined>).releaseAlertsToChief;
    expect((await post(admin, form)).status).toBe(302);
    expect((await readAgencySettings()).releaseAlertsToChief).toBe(false);
    expect((await post(admin, await validForm())).status).toBe(302);
  });

  it("a save with nothing changed writes nothing", async () => {
    const form = await validForm();
    await post(admin, form);
    const before = await db("agency_settings").where({ id: 1 }).first();
    const [{ n: auditsBefore }] = await settingsAudits();
    expect((await post(admin, await validForm())).status).toBe(302);
    expect(await db("agency_settings").where({ id: 1 }).first()).toEqual(before);
    const [{ n: auditsAfter }] = await settingsAudits();
    expect(Number(auditsAfter)).toBe(Number(auditsBefore));
  });

  it("saves the public-records settings with their audit; new requests use them, received ones keep their due dates", async () => {
    const requester = { name: "Settings Requester (test)", email: "requester@test.example" };
    expect((await post(admin, await validForm())).status).toBe(302);
    // Monday 21 December 2026, 10:00 in America/Denver (17:00 UTC); federal FOIA, 20 working days.
    const earlier = await createRecordsRequest(
      { ...requester, description: "Received before the rule changed (test)" },
      new Date("2026-12-21T17:00:00Z"),
    );
    const [{ n: auditsBefore }] = await settingsAudits();
    const before = await readAgencySettings();

    const saved = await post(
      admin,
      await validForm({
        recordsDueRule: "illinois",
        recordsOfficeCloses: "16:30",
        recordsClosureDays: "2026-12-24\n2026-12-24\n2026-12-07",
        recordsWithholdingRule: "  the exemptions of 5 ILCS 140/7 (test)  ",
      }),
    );
    expect(saved).toEqual({ status: 302, location: "/admin/settings" });
    const row = await db("agency_settings").where({ id: 1 }).first();
    expect(row.records_due_rule).toBe("illinois");
    expect(row.records_office_closes).toBe("16:30");
    expect(row.records_closure_days).toBe("2026-12-07\n2026-12-24");
    expect(row.records_withholding_rule).toBe("the exemptions of 5 ILCS 140/7 (test)");
    const settings = await readAgencySettings();
    expect(settings.recordsClosureDays).toEqual(["2026-12-07", "2026-12-24"]);
    expect(settings.version).not.toBe(before.version);

    const [{ n: auditsAfter }] = await settingsAudits();
    expect(Number(auditsAfter)).toBe(Number(auditsBefore) + 1);
    const audit = await db("audit_events").where({ action: "agency_settings_updated" }).orderBy("id", "desc").first();
    expect(audit.summary).toBe(
      "Changed recordsDueRule, recordsOfficeCloses, recordsClosureDays, recordsWithholdingRule",
    );
    expect(JSON.parse(audit.before_json)).toMatchObject({ recordsDueRule: "federal", recordsClosureDays: [] });
    expect(JSON.parse(audit.after_json)).toMatchObject({
      recordsDueRule: "illinois",
      recordsOfficeCloses: "16:30",
      recordsClosureDays: ["2026-12-07", "2026-12-24"],
    });

    // Federal FOIA, 20 working days, skipping 25 December, 1 January and 18 January (5 U.S.C. 6103).
    expect(earlier.dueOn).toBe("2027-01-21");

    // Illinois, 5 business days from Monday 21 December: 22, 23, (24 closed, 25 a federal holiday), 28, 29, 30.
    const morning = await createRecordsRequest(
      { ...requester, description: "Received in the morning after the change (test)" },
      new Date("2026-12-21T17:00:00Z"),
    );
    expect(morning.dueOn).toBe("2026-12-30");
    // 16:45 local is after the new closing time: day 0 is Tuesday 22 December, due Thursday 31 December.
    const late = await createRecordsRequest(
      { ...requester, description: "Received after the office closed (test)" },
      new Date("2026-12-21T23:45:00Z"),
    );
    expect(late.dueOn).toBe("2026-12-31");

    const dueOf = async (id: number) => {
      const value = (await db("records_requests").where({ id }).first("due_on")).due_on;
      return value instanceof Date ? value.toISOString().slice(0, 10) : String(value).slice(0, 10);
    };
    // The request received before the save keeps the due date it was given.
    expect(await dueOf(earlier.id)).toBe("2027-01-21");
    expect(await dueOf(morning.id)).toBe("2026-12-30");
    await db("records_requests").whereIn("id", [earlier.id, morning.id, late.id]).delete();
  });
});
