/**
 * The concentrate cost of an event: each line's concentrate × its product's unit cost per gallon,
 * at the catalogue's current unit cost (the catalogue keeps no price history). A basis for cost
 * recovery, not an invoice. Null when no line's product has a unit cost.
 */
export function concentrateCostSql(eventAlias: string): string {
  return `(SELECT SUM(cd.concentrate_gal * cp.unit_cost_per_gal) FROM discharges cd STRAIGHT_JOIN foam_products cp ON cp.id = cd.product_id WHERE cd.event_id = ${eventAlias}.id AND cp.unit_cost_per_gal IS NOT NULL)`;
}

export const CONCENTRATE_COST_HEADER = "Concentrate cost (US $, at current unit cost)";
