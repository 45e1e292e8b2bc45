import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  pfasGrams,
  pfasGramsPerLitre,
  reportableQuantityAnswers,
  rollingWindowTotals,
  substanceMass,
  worseAnswer,
  type PfasUse,
} from "./pfas";
import { GRAMS_PER_POUND } from "./units";

describe("PFAS mass estimates", () => {
  it("turns a g/L content into grams for a volume of concentrate", () => {
    // 10 g/L: the middle of the legacy PFOS AFFF range 5–15 g/L (an old product safety sheet;
    // academic measurements from memory). 90 US gal × 3.785411784 L/gal (NIST Handbook 44) = 340.68706056 L.
    expect(pfasGrams({ concentrateGal: 90, solutionGal: 3000 }, 10, "g_per_l")).toBeCloseTo(3406.8706056, 6);
    // 1 lb = 453.59237 g (NIST Handbook 44): about 7.51 lb, well over the 1 lb CERCLA RQ (40 CFR 302.4).
    expect(pfasGrams({ concentrateGal: 90, solutionGal: 3000 }, 10, "g_per_l") / GRAMS_PER_POUND).toBeCloseTo(
      7.510864,
      5,
    );
  });

  it("reads mg/L and % w/w (at 1 kg/L) the same way", () => {
    expect(pfasGramsPerLitre(10_000, "mg_per_l")).toBe(10);
    // 1 % w/w of a concentrate weighing 1 kg/L is 10 g/L — the "0.5–1.5 % w/w ≈ 5–15 g/L" pairing above.
    expect(pfasGramsPerLitre(1, "percent_w_w")).toBe(10);
  });

  it("finds the heaviest 24-hour period, excluding a release exactly 24 h later", () => {
    const at = (hours: number) => new Date(Date.UTC(2026, 6, 1) + hours * 3_600_000);
    const totals = rollingWindowTotals([
      { at: at(30), pounds: 0.4 },
      { at: at(0), pounds: 0.5 },
      { at: at(23.5), pounds: 0.3 },
      { at: at(47.5), pounds: 0.2 },
    ]);
    expect(totals[1]).toBeCloseTo(0.8, 12); // 0 h and 23.5 h
    expect(totals[2]).toBeCloseTo(0.7, 12); // 23.5 h and 30 h; 47.5 h is exactly 24 h later, outside
    expect(totals[0]).toBeCloseTo(0.6, 12); // 30 h and 47.5 h
    expect(totals[3]).toBeCloseTo(0.2, 12);
  });
});

describe("the reportable-quantity answer, PFOA and PFOS each (40 CFR 302.4 as amended by 89 FR 39124)", () => {
  const at = (iso: string) => new Date(iso);
  const use = (iso: string, content: PfasUse["content"], concentrateGal = 10): PfasUse => ({
    at: at(iso),
    concentrateGal,
    solutionGal: concentrateGal * 33,
    grossShare: 1,
    netShare: 0.5,
    content,
  });
  // 10 g/L PFOS: the middle of the legacy PFOS AFFF range 5–15 g/L (old product safety sheet; from memory).
  const pfos10 = { pfoa: { content: 0, unit: "g_per_l" as const }, pfos: { content: 10, unit: "g_per_l" as const } };

  it("a PFAS product with no known content answers Unknown, never No, by the mixture rule (40 CFR 302.6(b)(1)(ii))", () => {
    const [answer] = reportableQuantityAnswers([use("2026-05-01T10:00:00Z", { pfoa: null, pfos: null })], "pfos", 1);
    expect(answer.answer).toBe("unknown");
    expect(answer.unknownInWindow).toBe(1);
    expect(substanceMass(use("2026-05-01T10:00:00Z", { pfoa: null, pfos: null }), "pfos").grossPounds).toBeNull();
  });

  it("an unknown use within 24 h makes a known small release Unknown too", () => {
    const answers = reportableQuantityAnswers(
      [use("2026-05-01T10:00:00Z", pfos10, 1), use("2026-05-02T09:00:00Z", { pfoa: null, pfos: null })],
      "pfos",
      1,
    );
    // 1 gal × 3.785411784 L × 10 g/L = 37.85 g = 0.083 lb (NIST Handbook 44): below 1 lb on its own.
    expect(answers[0].windowPounds).toBeCloseTo(37.85411784 / 453.59237, 9);
    expect(answers.map((answer) => answer.answer)).toEqual(["unknown", "unknown"]);
  });

  it("PFOA and PFOS are run separately and not added (40 CFR 302.6): 0.6 lb of each is No for both", () => {
    const grams = 0.6 * 453.59237;
    const perLitre = grams / (10 * 3.785411784);
    const both = use("2026-05-01T10:00:00Z", {
      pfoa: { content: perLitre, unit: "g_per_l" },
      pfos: { content: perLitre, unit: "g_per_l" },
    });
    for (const substance of ["pfoa", "pfos"] as const) {
      const [answer] = reportableQuantityAnswers([both], substance, 1);
      expect(answer.windowPounds).toBeCloseTo(0.6, 9);
      expect(answer.answer).toBe("no");
    }
  });

  it("finds a pair across a quarter boundary: 31 March 23:00 and 1 April 01:00 share one 24-hour period", () => {
    // 0.6 lb each: together 1.2 lb ≥ 1 lb RQ.
    const perLitre = (0.6 * 453.59237) / (10 * 3.785411784);
    const content = { pfoa: null, pfos: { content: perLitre, unit: "g_per_l" as const } };
    const answers = reportableQuantityAnswers(
      [use("2026-03-31T23:00:00Z", content), use("2026-04-01T01:00:00Z", content)],
      "pfos",
      1,
    );
    expect(answers.map((answer) => answer.answer)).toEqual(["yes", "yes"]);
    expect(answers[0].windowPounds).toBeCloseTo(1.2, 9);
  });

  it("gross counts what reached any surface, land included (40 CFR 302.3); net what was not recovered", () => {
    const mass = substanceMass(use("2026-05-01T10:00:00Z", pfos10), "pfos");
    const pounds = (10 * 3.785411784 * 10) / 453.59237;
    expect(mass.grossPounds).toBeCloseTo(pounds, 9);
    expect(mass.netPounds).toBeCloseTo(pounds * 0.5, 9);
  });

  it("reads a lab result on foam solution against the solution, not the concentrate", () => {
    // 1,000 ng/L of solution on 330 gal of solution: 330 × 3.785411784 L × 1e-6 g/L.
    expect(pfasGrams({ concentrateGal: 10, solutionGal: 330 }, 1000, "ng_per_l_solution")).toBeCloseTo(
      330 * 3.785411784 * 1e-6,
      12,
    );
    expect(pfasGramsPerLitre(1000, "mg_per_kg")).toBe(1); // 1,000 mg/kg at the assumed 1 kg/L
    expect(worseAnswer("no", "unknown")).toBe("unknown");
    expect(worseAnswer("unknown", "yes")).toBe("yes");
  });
});

describe("the 24-hour reportable-quantity sweep", () => {
  // The definition, span by span: every span starting at a use, and for each use the heaviest and the
  // most unknown of the spans holding it. Quadratic and slow; the sweep must answer exactly the same.
  function bySpans(uses: PfasUse[], substance: "pfoa" | "pfos", thresholdLb: number, hours = 24) {
    const span = hours * 3_600_000;
    const masses = uses.map((use) => substanceMass(use, substance).grossPounds);
    const starts = uses.map((use) => use.at.getTime());
    const spans = starts.map((start) => {
      let pounds = 0;
      let unknown = 0;
      const members: number[] = [];
      starts.forEach((at, index) => {
        if (at >= start && at - start < span) {
          members.push(index);
          if (masses[index] === null) unknown++;
          else pounds += masses[index]!;
        }
      });
      return { pounds, unknown, members };
    });
    return uses.map((_use, index) => {
      const holding = spans.filter((candidate) => candidate.members.includes(index));
      const windowPounds = Math.max(0, ...holding.map((candidate) => candidate.pounds));
      const unknownInWindow = Math.max(0, ...holding.map((candidate) => candidate.unknown));
      const answer = windowPounds >= thresholdLb ? "yes" : unknownInWindow > 0 ? "unknown" : "no";
      return { answer, windowPounds, unknownInWindow };
    });
  }

  const content = fc.option(
    fc.record({ content: fc.double({ min: 0, max: 20, noNaN: true }), unit: fc.constant("g_per_l" as const) }),
    { nil: null },
  );
  const someUse = fc.record({
    // Within three days, to the minute and on the hour, so that spans overlap, touch and tie.
    minute: fc.oneof(
      fc.integer({ min: 0, max: 3 * 24 * 60 }),
      fc.integer({ min: 0, max: 72 }).map((hour) => hour * 60),
    ),
    concentrateGal: fc.double({ min: 0, max: 50, noNaN: true }),
    pfoa: content,
    pfos: content,
  });

  it("answers what checking every span answers, for uses in any order, at the same instant or a span apart", () => {
    fc.assert(
      fc.property(fc.array(someUse, { maxLength: 40 }), fc.constantFrom(0.01, 0.5, 1), (drawn, thresholdLb) => {
        const uses: PfasUse[] = drawn.map((use) => ({
          at: new Date(Date.UTC(2026, 4, 1) + use.minute * 60_000),
          concentrateGal: use.concentrateGal,
          solutionGal: use.concentrateGal * 33,
          grossShare: 1,
          netShare: 0.5,
          content: { pfoa: use.pfoa, pfos: use.pfos },
        }));
        for (const substance of ["pfoa", "pfos"] as const) {
          expect(reportableQuantityAnswers(uses, substance, thresholdLb)).toEqual(
            bySpans(uses, substance, thresholdLb),
          );
        }
      }),
      { numRuns: 300 },
    );
  });

  it("answers a busy quarter without comparing every span with every use", () => {
    // 6,000 uses a quarter apart by about 20 minutes: the span-by-span check takes minutes here.
    const uses: PfasUse[] = Array.from({ length: 6000 }, (_unused, index) => ({
      at: new Date(Date.UTC(2026, 0, 1) + index * 1_300_000),
      concentrateGal: 1,
      solutionGal: 33,
      grossShare: 1,
      netShare: 1,
      content: { pfoa: null, pfos: { content: 0.1, unit: "g_per_l" } },
    }));
    const answers = reportableQuantityAnswers(uses, "pfos", 1);
    // 1 gal × 3.785411784 L/gal × 0.1 g/L = 0.3785 g (NIST Handbook 44); a 24 h span holds 67 uses.
    const perUse = 0.3785411784 / GRAMS_PER_POUND;
    expect(answers[3000].windowPounds).toBeCloseTo(67 * perUse, 9);
    expect(answers.every((answer) => answer.answer === "no")).toBe(true);
  });
});
