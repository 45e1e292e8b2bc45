/**
 * The stock book's arithmetic: what a location holds is the sum of its movements, and every request
 * to move concentrate becomes signed movements here or is refused with the field to fix. Pure: the
 * server loads the movements that matter, plans with these functions and writes what they return;
 * the property test drives the same functions with random sequences.
 */
import type { StockMovementKind } from "../foam/vocabulary";

/** Movements are stored with 4 decimals of a gallon (DECIMAL(14,4)). */
export const GAL_PLACES = 4;
const EPSILON = 0.5 * 10 ** -GAL_PLACES;
/** The largest single movement a form takes (a tank farm would be more than a fire district keeps). */
export const MAX_MOVEMENT_GAL = 1_000_000;

export function roundGal(value: number): number {
  const factor = 10 ** GAL_PLACES;
  const rounded = Math.round(value * factor) / factor;
  return Object.is(rounded, -0) ? 0 : rounded;
}

/** One signed movement: into the location positive, out of it negative. */
export type BookEntry = {
  kind: StockMovementKind;
  locationId: number;
  productId: number;
  lotId: number | null;
  gal: number;
  eventId?: number | null;
  counterpartLocationId?: number | null;
};

export type StockRequest =
  | { kind: "received"; locationId: number; productId: number; lotId: number; gal: number }
  | {
      kind: "transferred";
      fromLocationId: number;
      toLocationId: number;
      productId: number;
      lotId?: number | null;
      gal: number;
    }
  | { kind: "sampled" | "disposed"; locationId: number; productId: number; lotId?: number | null; gal: number }
  | { kind: "adjusted"; locationId: number; productId: number; lotId: number | null; countedGal: number }
  /** A filed report's change in what it used from one location: more (positive) or less (negative). */
  | { kind: "used"; locationId: number; productId: number; gal: number; eventId: number }
  /** A filed report's change in what it refilled into a tank from a store. */
  | {
      kind: "refilled";
      fromLocationId: number;
      toLocationId: number;
      productId: number;
      gal: number;
      eventId: number;
    };

export type StockFacts = {
  heldForDisposal: (productId: number) => boolean;
  /** The product a lot is of (undefined: no such lot). */
  lotProduct: (lotId: number) => number | undefined;
  /** First-in, first-out order of lots (oldest first); by default the lot's id. */
  lotOrder?: (lotId: number) => number;
};

export type Plan = { ok: true; entries: BookEntry[] } | { ok: false; field: string; message: string };

const refuse = (field: string, message: string): Plan => ({ ok: false, field, message });

export const HELD_ONLY_TO_DISPOSAL =
  "This product is held for disposal: it can only be sent for disposal (or counted), not moved or sampled.";

/** What one location holds of one product, lot by lot (`null`: concentrate whose lot is not known). */
export function holdings(
  book: readonly BookEntry[],
  locationId: number,
  productId: number,
): Map<number | null, number> {
  const held = new Map<number | null, number>();
  for (const entry of book) {
    if (entry.locationId !== locationId || entry.productId !== productId) continue;
    held.set(entry.lotId, roundGal((held.get(entry.lotId) ?? 0) + entry.gal));
  }
  return held;
}

/** On hand of one product at one location, every lot together. */
export function onHand(
  book: readonly BookEntry[],
  locationId: number,
  productId: number,
  lotId?: number | null,
): number {
  const held = holdings(book, locationId, productId);
  if (lotId !== undefined) return held.get(lotId) ?? 0;
  let total = 0;
  for (const gal of held.values()) total += gal;
  return roundGal(total);
}

/** Balances of every (location, product, lot) the book names. */
export function balances(book: readonly BookEntry[]): Map<string, number> {
  const result = new Map<string, number>();
  for (const entry of book) {
    const key = balanceKey(entry.locationId, entry.productId, entry.lotId);
    result.set(key, roundGal((result.get(key) ?? 0) + entry.gal));
  }
  return result;
}

export function balanceKey(locationId: number, productId: number, lotId: number | null): string {
  return `${locationId}:${productId}:${lotId ?? "-"}`;
}

type Draw = { lotId: number | null; gal: number };

/**
 * Draws `gal` from what a location holds, oldest lot first. With `allowShort` the part not covered
 * by known lots is drawn as "lot not known" (a report says what was used; the book may be behind);
 * without it, null when the location holds less.
 */
function drawOldestFirst(
  held: Map<number | null, number>,
  gal: number,
  facts: StockFacts,
  allowShort: boolean,
): Draw[] | null {
  const order = facts.lotOrder ?? ((lotId: number) => lotId);
  const lots = [...held.entries()]
    .filter((entry): entry is [number, number] => entry[0] !== null && entry[1] > EPSILON)
    .sort((a, b) => order(a[0]) - order(b[0]) || a[0] - b[0]);
  const draws: Draw[] = [];
  let left = roundGal(gal);
  const unknown = held.get(null) ?? 0;
  if (unknown > EPSILON) lots.unshift([Number.NaN, unknown]);
  for (const [lotId, available] of lots) {
    if (left <= EPSILON) break;
    const take = roundGal(Math.min(available, left));
    draws.push({ lotId: Number.isNaN(lotId) ? null : lotId, gal: take });
    left = roundGal(left - take);
  }
  if (left > EPSILON) {
    if (!allowShort) return null;
    const existing = draws.find((draw) => draw.lotId === null);
    if (existing) existing.gal = roundGal(existing.gal + left);
    else draws.push({ lotId: null, gal: left });
  }
  return draws;
}

/**
 * Gives back up to `gal` of what an earlier draw for the same report took, newest first: the lot
 * not known first (it was the last resort), then lots from the newest. Anything past what was
 * taken comes back as "lot not known".
 */
function giveBack(taken: Map<number | null, number>, gal: number, facts: StockFacts): Draw[] {
  const order = facts.lotOrder ?? ((lotId: number) => lotId);
  const lots = [...taken.entries()]
    .filter(([, amount]) => amount > EPSILON)
    .sort((a, b) => {
      if (a[0] === null) return -1;
      if (b[0] === null) return 1;
      return order(b[0]) - order(a[0]) || b[0] - a[0];
    });
  const draws: Draw[] = [];
  let left = roundGal(gal);
  for (const [lotId, amount] of lots) {
    if (left <= EPSILON) break;
    const back = roundGal(Math.min(amount, left));
    draws.push({ lotId, gal: back });
    left = roundGal(left - back);
  }
  if (left > EPSILON) {
    const existing = draws.find((draw) => draw.lotId === null);
    if (existing) existing.gal = roundGal(existing.gal + left);
    else draws.push({ lotId: null, gal: left });
  }
  return draws;
}

/** What a report's movements of one kind took out of `locationId`, lot by lot (positive). */
function takenByEvent(
  book: readonly BookEntry[],
  kind: StockMovementKind,
  eventId: number,
  locationId: number,
  productId: number,
): Map<number | null, number> {
  const taken = new Map<number | null, number>();
  for (const entry of book) {
    if (entry.kind !== kind || entry.eventId !== eventId) continue;
    if (entry.locationId !== locationId || entry.productId !== productId) continue;
    taken.set(entry.lotId, roundGal((taken.get(entry.lotId) ?? 0) - entry.gal));
  }
  return taken;
}

/** Why a movement of `gal` cannot be booked, or null when it can. */
export function quantityError(gal: number): string | null {
  if (!Number.isFinite(gal)) return "Enter the quantity in gallons as a number.";
  if (gal <= 0) return "Enter a quantity of more than 0 gallons.";
  if (gal > MAX_MOVEMENT_GAL) return `A movement is at most ${MAX_MOVEMENT_GAL.toLocaleString("en-US")} gallons.`;
  return null;
}

/** The lots to take `gal` from at a location: the one named (which must be there), or oldest first. */
function drawsFor(
  book: readonly BookEntry[],
  locationId: number,
  productId: number,
  lotId: number | null | undefined,
  gal: number,
  facts: StockFacts,
): Draw[] | Plan {
  const held = holdings(book, locationId, productId);
  if (lotId != null) {
    if (facts.lotProduct(lotId) !== productId) return refuse("lotId", "This lot is not of the product chosen.");
    const available = held.get(lotId) ?? 0;
    if (available <= EPSILON) return refuse("lotId", "This location does not hold this lot.");
    if (gal > available + EPSILON) {
      return refuse("gal", `This location holds ${available} gal of this lot; you cannot move ${gal} gal.`);
    }
    return [{ lotId, gal: roundGal(gal) }];
  }
  const total = onHand(book, locationId, productId);
  if (gal > total + EPSILON) {
    return refuse("gal", `This location holds ${Math.max(0, total)} gal of this product; you cannot move ${gal} gal.`);
  }
  return drawOldestFirst(held, gal, facts, false)!;
}

const isPlan = (value: Draw[] | Plan): value is Plan => !Array.isArray(value);

/** The movements one request makes, or the field it is refused at. Nothing is written here. */
export function planMovement(book: readonly BookEntry[], request: StockRequest, facts: StockFacts): Plan {
  switch (request.kind) {
    case "received": {
      const problem = quantityError(request.gal);
      if (problem) return refuse("gal", problem);
      if (facts.lotProduct(request.lotId) !== request.productId) {
        return refuse("lotId", "This lot is not of the product chosen.");
      }
      return {
        ok: true,
        entries: [{ kind: "received", ...pick(request), lotId: request.lotId, gal: roundGal(request.gal) }],
      };
    }
    case "transferred": {
      const problem = quantityError(request.gal);
      if (problem) return refuse("gal", problem);
      if (request.fromLocationId === request.toLocationId) {
        return refuse("toLocationId", "Choose a different location to move the concentrate to.");
      }
      if (facts.heldForDisposal(request.productId)) return refuse("productId", HELD_ONLY_TO_DISPOSAL);
      const draws = drawsFor(book, request.fromLocationId, request.productId, request.lotId, request.gal, facts);
      if (isPlan(draws)) return draws;
      return { ok: true, entries: transferEntries(request, draws) };
    }
    case "sampled":
    case "disposed": {
      const problem = quantityError(request.gal);
      if (problem) return refuse("gal", problem);
      if (request.kind === "sampled" && facts.heldForDisposal(request.productId)) {
        return refuse("productId", HELD_ONLY_TO_DISPOSAL);
      }
      const draws = drawsFor(book, request.locationId, request.productId, request.lotId, request.gal, facts);
      if (isPlan(draws)) return draws;
      return {
        ok: true,
        entries: draws.map((draw) => ({
          kind: request.kind,
          locationId: request.locationId,
          productId: request.productId,
          lotId: draw.lotId,
          gal: -draw.gal,
        })),
      };
    }
    case "adjusted": {
      if (!Number.isFinite(request.countedGal)) return refuse("countedGal", "Enter what was counted as a number.");
      if (request.countedGal < 0) return refuse("countedGal", "A count cannot be below 0 gallons.");
      if (request.countedGal > MAX_MOVEMENT_GAL) return refuse("countedGal", "That count is larger than any store.");
      if (request.lotId != null && facts.lotProduct(request.lotId) !== request.productId) {
        return refuse("lotId", "This lot is not of the product chosen.");
      }
      const variance = roundGal(
        request.countedGal - onHand(book, request.locationId, request.productId, request.lotId),
      );
      if (Math.abs(variance) <= EPSILON) return { ok: true, entries: [] };
      return { ok: true, entries: [{ kind: "adjusted", ...pick(request), lotId: request.lotId, gal: variance }] };
    }
    case "used": {
      if (!Number.isFinite(request.gal)) return refuse("gal", "Enter the quantity in gallons as a number.");
      if (Math.abs(request.gal) <= EPSILON) return { ok: true, entries: [] };
      const draws =
        request.gal > 0
          ? drawOldestFirst(holdings(book, request.locationId, request.productId), request.gal, facts, true)!
          : giveBack(
              takenByEvent(book, "used", request.eventId, request.locationId, request.productId),
              -request.gal,
              facts,
            );
      const sign = request.gal > 0 ? -1 : 1;
      return {
        ok: true,
        entries: draws.map((draw) => ({
          kind: "used",
          locationId: request.locationId,
          productId: request.productId,
          lotId: draw.lotId,
          gal: sign * draw.gal,
          eventId: request.eventId,
        })),
      };
    }
    case "refilled": {
      if (!Number.isFinite(request.gal)) return refuse("gal", "Enter the quantity in gallons as a number.");
      if (Math.abs(request.gal) <= EPSILON) return { ok: true, entries: [] };
      if (request.gal > 0) {
        const draws = drawOldestFirst(
          holdings(book, request.fromLocationId, request.productId),
          request.gal,
          facts,
          true,
        )!;
        return { ok: true, entries: transferEntries(request, draws) };
      }
      // Less refilled than first filed: the tank gives back what this report put in, newest first.
      const draws = giveBack(
        negated(takenByEvent(book, "transferred", request.eventId, request.toLocationId, request.productId)),
        -request.gal,
        facts,
      );
      return {
        ok: true,
        entries: transferEntries(
          { ...request, fromLocationId: request.toLocationId, toLocationId: request.fromLocationId },
          draws,
        ),
      };
    }
  }
}

function negated(taken: Map<number | null, number>): Map<number | null, number> {
  return new Map([...taken.entries()].map(([lotId, gal]) => [lotId, roundGal(-gal)]));
}

function pick(request: { locationId: number; productId: number }) {
  return { locationId: request.locationId, productId: request.productId };
}

function transferEntries(
  request: { fromLocationId: number; toLocationId: number; productId: number; eventId?: number },
  draws: Draw[],
): BookEntry[] {
  return draws.flatMap((draw) => [
    {
      kind: "transferred" as const,
      locationId: request.fromLocationId,
      productId: request.productId,
      lotId: draw.lotId,
      gal: -draw.gal,
      eventId: request.eventId ?? null,
      counterpartLocationId: request.toLocationId,
    },
    {
      kind: "transferred" as const,
      locationId: request.toLocationId,
      productId: request.productId,
      lotId: draw.lotId,
      gal: draw.gal,
      eventId: request.eventId ?? null,
      counterpartLocationId: request.fromLocationId,
    },
  ]);
}

/** What a filed report has used from each (location, product) so far, as positive gallons. */
export function usedByEvent(book: readonly BookEntry[], eventId: number): Map<string, number> {
  const used = new Map<string, number>();
  for (const entry of book) {
    if (entry.kind !== "used" || entry.eventId !== eventId) continue;
    const key = `${entry.locationId}:${entry.productId}`;
    used.set(key, roundGal((used.get(key) ?? 0) - entry.gal));
  }
  return used;
}

// ---------------------------------------------------------------------------------------------
// Readiness

/**
 * The concentrate rate of a typical Class B attack: solution flow × percentage. The example of the
 * issue: 95 gpm of foam solution at 3 % → 2.85 gpm of concentrate (NFPA 11 states the percentage
 * as a share of solution, §12.6.5). The attack itself is an agency setting (common practice, no source).
 */
export function attackConcentrateGpm(solutionGpm: number, percent: number): number {
  return (solutionGpm * percent) / 100;
}

/** Minutes of that attack the Class B concentrate on hand supports (none when the rate is not positive). */
export function attackMinutes(classBGal: number, solutionGpm: number, percent: number): number | null {
  const rate = attackConcentrateGpm(solutionGpm, percent);
  if (!(rate > 0)) return null;
  return Math.max(0, classBGal) / rate;
}
