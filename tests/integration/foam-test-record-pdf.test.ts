// The printable record of an accuracy test: a PDF for those who may read the fleet, a 404 for a test of another system.
import { beforeAll, describe, expect, it } from "vitest";
import { db } from "~/lib/db.server";
import { loader as recordPdf } from "~/routes/foam-systems.$systemId.tests.$testId.record-pdf";
import { makeApparatusRow } from "../support/catalogue-factories";
import { makeUser, TEST_PASSWORD } from "../support/factories";
import { getRequest, routeArgs, settle } from "../support/requests";
import { signIn } from "../support/session";
import { ensureAgency } from "../support/usage-fixtures";

let cookie: string;
let systemId: number;
let testId: number;

beforeAll(async () => {
  await ensureAgency();
  const officer = await makeUser(["officer"], "Officer Printer");
  cookie = await signIn(officer.email, TEST_PASSWORD);
  const apparatus = await makeApparatusRow();
  [systemId] = await db("foam_systems").insert({ apparatus_id: apparatus.id, name: "Printed system" });
  [testId] = await db("foam_accuracy_tests").insert({
    foam_system_id: systemId,
    tested_at: new Date("2026-04-01T15:00:00Z"),
    tested_by: officer.id,
    method: "flow",
    foam_class: "B",
    rated_percent: 3,
    readings_json: JSON.stringify({
      method: "flow",
      foamClass: "B",
      ratedPercent: 3,
      concentrateGal: 3.2,
      waterGal: 96.8,
    }),
    achieved_percent: 3.2,
    band_low: 3,
    band_high: 3.9,
    pass: true,
  });
});

const get = (system: number, test: number) =>
  settle(() =>
    recordPdf(
      routeArgs(getRequest(`/foam-systems/${system}/tests/${test}/record.pdf`, { Cookie: cookie }), {
        systemId: String(system),
        testId: String(test),
      }),
    ),
  );

describe("the printable accuracy-test record", () => {
  it("is a PDF", async () => {
    const outcome = await get(systemId, testId);
    const response = outcome.value as Response;
    expect(response.status).toBe(200);
    expect(response.headers.get("Content-Type")).toBe("application/pdf");
    expect(
      Buffer.from(await response.arrayBuffer())
        .subarray(0, 5)
        .toString(),
    ).toBe("%PDF-");
  });

  it("is not found under another system", async () => {
    const outcome = await get(systemId + 100_000, testId);
    expect(outcome.thrown).toBe(true);
    expect((outcome.value as { init?: { status?: number } }).init?.status).toBe(404);
  });
});
