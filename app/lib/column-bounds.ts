/**
 * The DECIMAL columns that catalogue forms write, with the precision and scale the migrations give
 * them. A form's largest accepted value comes from here, so a number the column cannot hold is a
 * field error, never a refused INSERT (MariaDB in strict mode refuses out-of-range values).
 * `tests/integration/column-bounds.test.ts` compares this list with the database's own column types.
 */
export const DECIMAL_COLUMNS = {
  "foam_products.unit_cost_per_gal": { precision: 10, scale: 2 },
  "foam_products.pfas_content": { precision: 14, scale: 6 },
} as const;

export type DecimalColumn = keyof typeof DECIMAL_COLUMNS;

/** The largest value DECIMAL(precision, scale) holds: precision − scale digits before the point, scale after. */
export function decimalColumnMax(column: DecimalColumn): number {
  const { precision, scale } = DECIMAL_COLUMNS[column];
  return Number(`${"9".repeat(precision - scale)}.${"9".repeat(scale)}`);
}
