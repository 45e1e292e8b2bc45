// The printable record of an accuracy test: a PDF for those who may read the fleet, a 404 for a test of another system.
import { beforeAll, describe, expect, it } from "vitest";
import { loader as recordPdf } from "~/routes/foam-systems.$systemId.tests.$testId.record-pdf";
import { makeSystemWithFlowTest } from "../support/catalogue-factories";
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
  ({ systemId, testId } = await makeSystemWithFlowTest("Printed system", officer.id));
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
