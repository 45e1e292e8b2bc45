import { describe, expect, it } from "vitest";
import { DECIMAL_COLUMNS, decimalColumnMax, type DecimalColumn } from "~/lib/column-bounds";
import { db } from "~/lib/db.server";

describe("the bounds forms derive from column types", () => {
  it.each(Object.keys(DECIMAL_COLUMNS) as DecimalColumn[])("%s matches the migrated column", async (column) => {
    const [table, name] = column.split(".");
    const row = await db("information_schema.columns")
      .where({ table_schema: db.raw("database()"), table_name: table, column_name: name })
      .first("data_type", "numeric_precision", "numeric_scale");
    expect(row.data_type).toBe("decimal");
    expect(Number(row.numeric_precision)).toBe(DECIMAL_COLUMNS[column].precision);
    expect(Number(row.numeric_scale)).toBe(DECIMAL_COLUMNS[column].scale);
  });

  it("the largest value is accepted by the column and one step more is refused", async () => {
    expect(decimalColumnMax("foam_products.unit_cost_per_gal")).toBe(99_999_999.99);
    const [{ fits }] = (await db.raw("SELECT CAST(? AS DECIMAL(10,2)) = ? AS fits", [99_999_999.99, 99_999_999.99]))[0];
    expect(Number(fits)).toBe(1);
  });
});
