import { describe, expect, it } from "vitest";
import { csvLine } from "~/lib/csv";
import { csvRows } from "./environmental-csv.server";
import type { Column } from "./environmental-tables.server";

type Row = { number: string; note: string };
const columns: Column<Row>[] = [
  { key: "number", header: "Event number", width: 12, value: (row) => row.number },
  { key: "note", header: "Note", width: 40, value: (row) => row.note },
];

describe("csvRows", () => {
  it("writes every row once, in order, in chunks far fewer than the rows", async () => {
    const rows = Array.from({ length: 5000 }, (_, index) => ({
      number: `AB-${index}`,
      note: `Line "${index}", runoff to soil (demo)`,
    }));
    const chunks: string[] = [];
    for await (const chunk of csvRows(columns, rows)) chunks.push(chunk);
    const expected =
      "\uFEFF" + csvLine(["Event number", "Note"]) + rows.map((row) => csvLine([row.number, row.note])).join("");
    expect(chunks.join("")).toBe(expected);
    expect(chunks.length).toBeGreaterThan(1);
    expect(chunks.length).toBeLessThan(rows.length / 100);
  });

  it("writes the header alone for a period without rows", async () => {
    const chunks: string[] = [];
    for await (const chunk of csvRows(columns, [])) chunks.push(chunk);
    expect(chunks.join("")).toBe("\uFEFF" + csvLine(["Event number", "Note"]));
  });
});
