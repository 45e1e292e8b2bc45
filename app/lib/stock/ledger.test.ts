import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  attackConcentrateGpm,
  attackMinutes,
  HELD_ONLY_TO_DISPOSAL,
  holdings,
  onHand,
  planMovement,
  roundGal,
  usedByEvent,
  type BookEntry,
  type StockFacts,
  type StockRequest,
} from "./ledger";

// Two products: 1 in use, 2 held for disposal. Lots 11 and 12 are of product 1, lot 21 of product 2.
const LOT_PRODUCT = new Map([
  [11, 1],
  [12, 1],
  [21, 2],
]);
const facts: StockFacts = {
  heldForDisposal: (productId) => productId === 2,
  lotProduct: (lotId) => LOT_PRODUCT.get(lotId),
};
const LOCATIONS = [1, 2, 3];

function apply(book: BookEntry[], request: StockRequest) {
  const plan = planMovement(book, request, facts);
  if (plan.ok) book.push(...plan.entries);
  return plan;
}

describe("planMovement", () => {
  it("receives into a lot, moves it and refuses more than the source holds, at the quantity", () => {
    const book: BookEntry[] = [];
    expect(apply(book, { kind: "received", locationId: 1, productId: 1, lotId: 11, gal: 275 }).ok).toBe(true);
    const tooMuch = apply(book, { kind: "transferred", fromLocationId: 1, toLocationId: 2, productId: 1, gal: 300 });
    expect(tooMuch).toMatchObject({ ok: false, field: "gal" });
    expect(apply(book, { kind: "transferred", fromLocationId: 1, toLocationId: 2, productId: 1, gal: 40 }).ok).toBe(
      true,
    );
    expect(onHand(book, 1, 1)).toBe(235);
    expect(onHand(book, 2, 1, 11)).toBe(40);
  });

  it("refuses a lot that the location does not hold, and a lot of another product, at the lot", () => {
    const book: BookEntry[] = [{ kind: "received", locationId: 1, productId: 1, lotId: 11, gal: 10 }];
    expect(
      planMovement(book, { kind: "sampled", locationId: 2, productId: 1, lotId: 11, gal: 1 }, facts),
    ).toMatchObject({ ok: false, field: "lotId", message: "This location does not hold this lot." });
    expect(
      planMovement(book, { kind: "received", locationId: 1, productId: 1, lotId: 21, gal: 1 }, facts),
    ).toMatchObject({ ok: false, field: "lotId" });
  });

  it("refuses negative, zero and non-numeric quantities at the quantity", () => {
    for (const gal of [-5, 0, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(planMovement([], { kind: "received", locationId: 1, productId: 1, lotId: 11, gal }, facts)).toMatchObject({
        ok: false,
        field: "gal",
      });
    }
    expect(
      planMovement([], { kind: "adjusted", locationId: 1, productId: 1, lotId: null, countedGal: -1 }, facts),
    ).toMatchObject({ ok: false, field: "countedGal" });
  });

  it("lets a product held for disposal go only to disposal", () => {
    const book: BookEntry[] = [{ kind: "received", locationId: 1, productId: 2, lotId: 21, gal: 55 }];
    expect(
      planMovement(book, { kind: "transferred", fromLocationId: 1, toLocationId: 2, productId: 2, gal: 5 }, facts),
    ).toEqual({ ok: false, field: "productId", message: HELD_ONLY_TO_DISPOSAL });
    expect(planMovement(book, { kind: "sampled", locationId: 1, productId: 2, gal: 1 }, facts).ok).toBe(false);
    const disposed = planMovement(book, { kind: "disposed", locationId: 1, productId: 2, gal: 55 }, facts);
    expect(disposed).toEqual({
      ok: true,
      entries: [{ kind: "disposed", locationId: 1, productId: 2, lotId: 21, gal: -55 }],
    });
  });

  it("draws the oldest lot first and books what a report used past the lots as lot not known", () => {
    const book: BookEntry[] = [
      { kind: "received", locationId: 1, productId: 1, lotId: 12, gal: 5 },
      { kind: "received", locationId: 1, productId: 1, lotId: 11, gal: 5 },
    ];
    const plan = planMovement(book, { kind: "used", locationId: 1, productId: 1, gal: 12, eventId: 7 }, facts);
    expect(plan).toEqual({
      ok: true,
      entries: [
        { kind: "used", locationId: 1, productId: 1, lotId: 11, gal: -5, eventId: 7 },
        { kind: "used", locationId: 1, productId: 1, lotId: 12, gal: -5, eventId: 7 },
        { kind: "used", locationId: 1, productId: 1, lotId: null, gal: -2, eventId: 7 },
      ],
    });
  });

  it("posts a count's variance as one adjustment and nothing when the count agrees", () => {
    const book: BookEntry[] = [{ kind: "received", locationId: 1, productId: 1, lotId: 11, gal: 100 }];
    expect(apply(book, { kind: "adjusted", locationId: 1, productId: 1, lotId: 11, countedGal: 96.5 })).toEqual({
      ok: true,
      entries: [{ kind: "adjusted", locationId: 1, productId: 1, lotId: 11, gal: -3.5 }],
    });
    expect(apply(book, { kind: "adjusted", locationId: 1, productId: 1, lotId: 11, countedGal: 96.5 })).toEqual({
      ok: true,
      entries: [],
    });
  });
});

// ---------------------------------------------------------------------------------------------
// Random sequences: every step keeps the balances equal to received − used − sampled − disposed ±
// adjustments (+ transfers in − out per location), never takes a known lot below zero, and a
// report's use stays whatever it was last filed as, however often it is filed again.

const location = fc.constantFrom(...LOCATIONS);
const product = fc.constantFrom(1, 2);
const gal = fc.oneof(
  fc.double({ min: -50, max: 400, noNaN: true }),
  fc.constant(0),
  fc.constant(Number.NaN),
  fc.integer({ min: 1, max: 300 }),
);
const lotFor = (productId: number) => (productId === 1 ? fc.constantFrom(11, 12) : fc.constant(21));

type Step = StockRequest | { kind: "file"; eventId: number; locationId: number; productId: number; usedGal: number };

const step: fc.Arbitrary<Step> = fc.oneof(
  product.chain((productId) =>
    fc.record({
      kind: fc.constant("received" as const),
      locationId: location,
      productId: fc.constant(productId),
      lotId: lotFor(productId),
      gal,
    }),
  ),
  fc.record({
    kind: fc.constant("transferred" as const),
    fromLocationId: location,
    toLocationId: location,
    productId: product,
    lotId: fc.option(fc.constantFrom(11, 12, 21), { nil: null }),
    gal,
  }),
  fc.record({
    kind: fc.constantFrom("sampled" as const, "disposed" as const),
    locationId: location,
    productId: product,
    lotId: fc.option(fc.constantFrom(11, 12, 21), { nil: null }),
    gal,
  }),
  product.chain((productId) =>
    fc.record({
      kind: fc.constant("adjusted" as const),
      locationId: location,
      productId: fc.constant(productId),
      lotId: fc.option(lotFor(productId), { nil: null }),
      countedGal: fc.double({ min: -5, max: 300, noNaN: true }),
    }),
  ),
  // A report filed (again, or revised) with this much used from one location.
  fc.record({
    kind: fc.constant("file" as const),
    eventId: fc.constantFrom(101, 102),
    locationId: location,
    productId: fc.constant(1),
    usedGal: fc.double({ min: 0, max: 80, noNaN: true }),
  }),
);

const sumBy = (book: BookEntry[], keep: (entry: BookEntry) => boolean) =>
  roundGal(book.filter(keep).reduce((total, entry) => total + entry.gal, 0));

describe("the stock book over random movement sequences", () => {
  it("keeps every balance equal to what was received, used, sampled, disposed and adjusted", () => {
    fc.assert(
      fc.property(fc.array(step, { maxLength: 60 }), (steps) => {
        const book: BookEntry[] = [];
        // The expected balance per location and product, kept from the requests alone.
        const expected = new Map<string, number>();
        const add = (locationId: number, productId: number, amount: number) => {
          const key = `${locationId}:${productId}`;
          expected.set(key, roundGal((expected.get(key) ?? 0) + amount));
        };
        const filed = new Map<string, number>();
        for (const next of steps) {
          const before = book.length;
          if (next.kind === "file") {
            const key = `${next.locationId}:${next.productId}`;
            const already = usedByEvent(book, next.eventId).get(key) ?? 0;
            const target = roundGal(next.usedGal);
            const plan = apply(book, {
              kind: "used",
              locationId: next.locationId,
              productId: next.productId,
              gal: roundGal(target - already),
              eventId: next.eventId,
            });
            expect(plan.ok).toBe(true);
            add(next.locationId, next.productId, roundGal(already - target));
            filed.set(`${next.eventId}:${key}`, target);
            expect(usedByEvent(book, next.eventId).get(key) ?? 0).toBeCloseTo(target, 3);
            continue;
          }
          const lotBefore = next.kind === "adjusted" ? onHand(book, next.locationId, next.productId, next.lotId) : 0;
          const plan = apply(book, next);
          if (!plan.ok) {
            expect(book.length).toBe(before);
            expect(plan.message.length).toBeGreaterThan(0);
            continue;
          }
          expect(["transferred", "sampled"].includes(next.kind) && next.productId === 2).toBe(false);
          switch (next.kind) {
            case "received":
              add(next.locationId, next.productId, roundGal(next.gal));
              break;
            case "transferred":
              add(next.fromLocationId, next.productId, -roundGal(next.gal));
              add(next.toLocationId, next.productId, roundGal(next.gal));
              break;
            case "sampled":
            case "disposed":
              add(next.locationId, next.productId, -roundGal(next.gal));
              break;
            case "adjusted":
              add(next.locationId, next.productId, roundGal(next.countedGal - lotBefore));
              expect(onHand(book, next.locationId, next.productId, next.lotId)).toBeCloseTo(next.countedGal, 3);
              break;
          }
          // Moves that people ask for never take a known lot below zero.
          for (const locationId of LOCATIONS) {
            for (const [lotId, held] of holdings(book, locationId, next.productId)) {
              if (lotId !== null && next.kind !== "adjusted") expect(held).toBeGreaterThan(-1e-3);
            }
          }
        }
        for (const locationId of LOCATIONS) {
          for (const productId of [1, 2]) {
            expect(onHand(book, locationId, productId)).toBeCloseTo(expected.get(`${locationId}:${productId}`) ?? 0, 2);
          }
        }
        // District-wide: transfers cancel; the rest is received − used − sampled − disposed ± adjusted.
        for (const productId of [1, 2]) {
          const of = (kind: BookEntry["kind"]) =>
            sumBy(book, (entry) => entry.productId === productId && entry.kind === kind);
          const district = sumBy(book, (entry) => entry.productId === productId);
          expect(of("transferred")).toBeCloseTo(0, 3);
          expect(district).toBeCloseTo(
            of("received") + of("used") + of("sampled") + of("disposed") + of("adjusted"),
            3,
          );
        }
        // Each report has used, per location, exactly what it was last filed with.
        for (const [key, target] of filed) {
          const [eventId, locationId, productId] = key.split(":").map(Number);
          expect(usedByEvent(book, eventId).get(`${locationId}:${productId}`) ?? 0).toBeCloseTo(target, 3);
        }
      }),
      { numRuns: 300 },
    );
  });
});

describe("readiness", () => {
  // Hand-computed: 95 gpm of foam solution at 3 % is 2.85 gpm of concentrate (issue 15's example);
  // 285 gal ÷ 2.85 gpm = 100 minutes; 57 gal ÷ (125 gpm × 6 % = 7.5 gpm) = 7.6 minutes.
  it("gives minutes of a typical Class B attack from the gallons on hand", () => {
    expect(attackConcentrateGpm(95, 3)).toBeCloseTo(2.85, 10);
    expect(attackMinutes(285, 95, 3)).toBeCloseTo(100, 10);
    expect(attackMinutes(57, 125, 6)).toBeCloseTo(7.6, 10);
    expect(attackMinutes(0, 95, 3)).toBe(0);
    expect(attackMinutes(-4, 95, 3)).toBe(0);
    expect(attackMinutes(10, 0, 3)).toBeNull();
  });
});
