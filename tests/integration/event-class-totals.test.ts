import { beforeAll, describe, expect, it } from "vitest";
import type { SessionUser } from "~/lib/auth.server";
import { ProductFormSchema } from "~/lib/catalogue/product-form";
import { db } from "~/lib/db.server";
import { currentDataVersions } from "~/models/data-version.server";
import { saveProduct } from "~/models/product.server";
import { statedResults, writeReportLines } from "~/models/report-rows.server";
import { makeUser } from "../support/factories";
import { ensureAgency, makeEvent, makeProduct } from "../support/usage-fixtures";

// Each event keeps its concentrate by foam class and the classes it used (decision 180). Whatever
// writes lines or changes a product's class, the kept figures equal the discharges grouped afresh.

/** The straightforward answer: the event's discharges and their products' classes, summed now. */
async function groupedAfresh(eventId: number) {
  const rows = await db("discharges as d")
    .join("foam_products as p", "p.id", "d.product_id")
    .where("d.event_id", eventId)
    .select("p.foam_class", "d.concentrate_gal");
  const sum = (foamClass: string) =>
    rows.filter((row) => row.foam_class === foamClass).reduce((total, row) => total + Number(row.concentrate_gal), 0);
  const classes = [...new Set(rows.map((row) => row.foam_class as string))].sort().join(",");
  return { a: sum("A"), b: sum("B"), classes };
}

async function kept(eventId: number) {
  const row = await db("events")
    .where({ id: eventId })
    .first("class_a_concentrate_gal", "class_b_concentrate_gal", "foam_classes");
  return { a: Number(row.class_a_concentrate_gal), b: Number(row.class_b_concentrate_gal), classes: row.foam_classes };
}

const startedAt = new Date("2038-05-01T12:00:00Z");

describe("concentrate by foam class kept on the event", () => {
  let officer: SessionUser;
  let classA: number;
  let classB: number;

  beforeAll(async () => {
    await ensureAgency(db);
    const made = await makeUser(["officer", "admin"], "Class Totals Officer");
    officer = { id: made.id, email: made.email, name: made.name, roles: made.roles, stationId: null };
    classA = (await makeProduct({ foamClass: "A" })).id;
    classB = (await makeProduct({ foamClass: "B" })).id;
  });

  it("sums each class when the lines are written", async () => {
    const event = await makeEvent({
      createdBy: officer.id,
      startedAt,
      discharges: [
        { productId: classA, percent: 0.5, water: 800, concentrate: 4.125 },
        { productId: classB, percent: 3, water: 291, concentrate: 9 },
        { productId: classA, percent: 0.3, water: 100, concentrate: 0.3 },
        { productId: null, water: 500, concentrate: 0 },
      ],
    });
    expect(await kept(event.id)).toEqual({ a: 4.425, b: 9, classes: "A,B" });
    expect(await kept(event.id)).toEqual(await groupedAfresh(event.id));
  });

  it("names a class whose line flowed no concentrate, and none for water alone", async () => {
    const dry = await makeEvent({
      createdBy: officer.id,
      startedAt,
      discharges: [{ productId: classB, percent: 3, water: 0, concentrate: 0 }],
    });
    expect(await kept(dry.id)).toEqual({ a: 0, b: 0, classes: "B" });
    const water = await makeEvent({
      createdBy: officer.id,
      startedAt,
      discharges: [{ productId: null, water: 300, concentrate: 0 }],
    });
    expect(await kept(water.id)).toEqual({ a: 0, b: 0, classes: "" });
  });

  it("follows lines that are replaced", async () => {
    const event = await makeEvent({
      createdBy: officer.id,
      startedAt,
      discharges: [
        { productId: classA, percent: 0.5, water: 800, concentrate: 4 },
        { productId: classB, percent: 3, water: 291, concentrate: 9 },
      ],
    });
    await writeReportLines(
      db,
      event.id,
      { discharges: [{ productId: classB, percent: 3, flow: 100, minutes: 10, apparatusId: null }] },
      statedResults([{ water: 970, concentrate: 30 }]),
      { replace: true },
    );
    expect(await kept(event.id)).toEqual({ a: 0, b: 30, classes: "B" });
    await writeReportLines(db, event.id, { discharges: [] }, statedResults([]), { replace: true });
    expect(await kept(event.id)).toEqual({ a: 0, b: 0, classes: "" });
  });

  it("moves an event's concentrate when its product's class is changed, and marks the reports changed", async () => {
    const changing = (await makeProduct({ foamClass: "A" })).id;
    const event = await makeEvent({
      createdBy: officer.id,
      startedAt,
      discharges: [
        { productId: changing, percent: 0.5, water: 800, concentrate: 4 },
        { productId: classB, percent: 3, water: 291, concentrate: 9 },
      ],
    });
    expect(await kept(event.id)).toEqual({ a: 4, b: 9, classes: "A,B" });
    const row = await db("foam_products").where({ id: changing }).first();
    const before = await currentDataVersions(db);
    await saveProduct(
      changing,
      Number(row.version),
      ProductFormSchema.parse({ name: row.name, foamClass: "B", foamType: "f3", nominalPercents: "3" }),
      null,
      officer,
    );
    expect(await kept(event.id)).toEqual({ a: 0, b: 13, classes: "B" });
    expect((await currentDataVersions(db)).reports).not.toBe(before.reports);
  });

  it("agrees with the discharges grouped afresh for every event written here", async () => {
    const mismatched = await db.raw(
      `
      SELECT e.id FROM events e
      LEFT JOIN (
        SELECT d.event_id,
          SUM(CASE WHEN p.foam_class = 'A' THEN d.concentrate_gal ELSE 0 END) AS a,
          SUM(CASE WHEN p.foam_class = 'B' THEN d.concentrate_gal ELSE 0 END) AS b,
          GROUP_CONCAT(DISTINCT p.foam_class ORDER BY p.foam_class) AS classes
        FROM discharges d JOIN foam_products p ON p.id = d.product_id GROUP BY d.event_id
      ) c ON c.event_id = e.id
      WHERE e.created_by = ? AND (e.class_a_concentrate_gal <> COALESCE(c.a, 0)
         OR e.class_b_concentrate_gal <> COALESCE(c.b, 0)
         OR e.foam_classes <> COALESCE(c.classes, ''))`,
      [officer.id],
    );
    expect(Number((await db("events").where({ created_by: officer.id }).count({ n: "*" }))[0].n)).toBeGreaterThan(4);
    expect(mismatched[0]).toEqual([]);
  });
});
