import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { beforeAll, describe, expect, it } from "vitest";
import { ReportSummary } from "~/components/report-summary";
import { db } from "~/lib/db.server";
import { UNACCOUNTED_LABEL } from "~/lib/foam/vocabulary";
import { getReport } from "~/models/event-read.server";
import { makeUser } from "../support/factories";
import { ensureAgency, makeEvent, makeProduct } from "../support/usage-fixtures";

// Issue 10 §4, corrections found in review: runoff volumes below the solution total leave an
// "unaccounted" line on the event page.
describe("runoff that does not add up, on the event page", () => {
  let shortId: number;
  let fullId: number;

  beforeAll(async () => {
    await ensureAgency(db);
    const officer = await makeUser(["officer"], "Unaccounted Officer");
    const product = await makeProduct({ foamClass: "B", foamType: "f3" });
    // 970 + 30 = 1,000 gal of solution: 300 gal contained and 20 % (200 gal) to soil leave 500 gal.
    shortId = (
      await makeEvent({
        createdBy: officer.id,
        startedAt: new Date("2036-02-01T15:00:00Z"),
        discharges: [{ productId: product.id, percent: 3, water: 970, concentrate: 30 }],
        dispositions: [
          { disposition: "contained", volumeGal: 300, disposalReference: "Drum U-1" },
          { disposition: "soil", sharePercent: 20 },
        ],
      })
    ).id;
    fullId = (
      await makeEvent({
        createdBy: officer.id,
        startedAt: new Date("2036-02-02T15:00:00Z"),
        discharges: [{ productId: product.id, percent: 3, water: 970, concentrate: 30 }],
        dispositions: [{ disposition: "contained", sharePercent: 100, disposalReference: "Drum U-2" }],
      })
    ).id;
  });

  it("shows the 500 gal no line accounts for", async () => {
    const report = await getReport(shortId);
    expect(report?.unaccountedGal).toBeCloseTo(500, 6);
    const html = renderToStaticMarkup(createElement(ReportSummary, { report: report! }));
    expect(html).toContain(UNACCOUNTED_LABEL);
    expect(html).toMatch(/500(\.0+)?<\/td>/);
  });

  it("shows no such line when the runoff adds up", async () => {
    const report = await getReport(fullId);
    expect(report?.unaccountedGal).toBe(0);
    expect(renderToStaticMarkup(createElement(ReportSummary, { report: report! }))).not.toContain(UNACCOUNTED_LABEL);
  });
});
