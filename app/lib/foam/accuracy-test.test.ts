import { linearRegression, linearRegressionLine, rSquared } from "simple-statistics";
import { describe, expect, it } from "vitest";
import {
  accuracyBand,
  AccuracyTestInputSchema,
  computeAccuracyTest,
  fitCalibration,
  MAX_CALIBRATION_POINTS,
  withinBand,
} from "./accuracy-test";

describe("the calibration fit", () => {
  it("matches a hand-computed least-squares line: (0,0) (1,1) (2,1) (3,2) → slope 0.6, intercept 0.1, R² 0.9", () => {
    // By hand: mean x 1.5, mean y 1; Sxx 5, Sxy 3 → slope 0.6, intercept 1 − 0.6 × 1.5 = 0.1;
    // residuals −0.1, 0.3, −0.3, 0.1 → SSres 0.2 of SStot 2 → R² 0.9.
    const fit = fitCalibration([
      { percent: 0, reading: 0 },
      { percent: 1, reading: 1 },
      { percent: 2, reading: 1 },
      { percent: 3, reading: 2 },
    ]);
    expect(fit.slope).toBeCloseTo(0.6, 12);
    expect(fit.intercept).toBeCloseTo(0.1, 12);
    expect(fit.r2).toBeCloseTo(0.9, 12);
  });

  it("agrees with simple-statistics on a refractometer set of 0, half, rated and twice rated (3 %)", () => {
    // An invented set of readings for a 3 % concentrate, read on a refractometer scale.
    const points = [
      { percent: 0, reading: 0.1 },
      { percent: 1.5, reading: 0.62 },
      { percent: 3, reading: 1.09 },
      { percent: 6, reading: 2.16 },
    ];
    const pairs = points.map((point) => [point.percent, point.reading]);
    const independent = linearRegression(pairs);
    const ours = fitCalibration(points);
    expect(ours.slope).toBeCloseTo(independent.m, 12);
    expect(ours.intercept).toBeCloseTo(independent.b, 12);
    expect(ours.r2).toBeCloseTo(rSquared(pairs, linearRegressionLine(independent)), 12);
  });

  it("reads a sample back through the line: a perfect line 2x + 1 and reading 6 give 2.5 %", () => {
    const result = computeAccuracyTest(
      {
        method: "refractometer",
        foamClass: "B",
        ratedPercent: 3,
        calibration: [0, 1, 2, 3].map((percent) => ({ percent, reading: 2 * percent + 1 })),
        sampleReading: 7,
      },
      0.3,
    );
    expect(result.achievedPercent).toBeCloseTo(3, 12);
    expect(result.r2).toBeCloseTo(1, 12);
    expect(result.pass).toBe(true);
  });
});

describe("the band, NFPA 11 (2021) §12.6.5 for Class B: rated to the lesser of +30 % or +1 point", () => {
  const band3 = accuracyBand("B", 3, 0.3);
  it("3 % → 3.0 to 3.9: 3.0 and 3.9 pass, 2.95 and 3.95 fail", () => {
    expect(band3).toEqual([3, 3.9]);
    expect(withinBand(3.0, band3)).toBe(true);
    expect(withinBand(3.9, band3)).toBe(true);
    expect(withinBand(2.95, band3)).toBe(false);
    expect(withinBand(3.95, band3)).toBe(false);
  });

  it("6 % → 6.0 to 7.0 (the 1-point limit is the lesser): 7.0 passes, 7.05 fails", () => {
    const band6 = accuracyBand("B", 6, 0.3);
    expect(band6).toEqual([6, 7]);
    expect(withinBand(7.0, band6)).toBe(true);
    expect(withinBand(7.05, band6)).toBe(false);
  });

  it("1 % → 1.0 to 1.3 (the 30 % limit is the lesser)", () => {
    expect(accuracyBand("B", 1, 0.3)).toEqual([1, 1.3]);
  });

  it("takes the band edges through a flow test too: 3.9 gal in 100 gal of solution passes at 3 %", () => {
    const pass = computeAccuracyTest(
      { method: "flow", foamClass: "B", ratedPercent: 3, concentrateGal: 3.9, waterGal: 96.1 },
      0.3,
    );
    expect(pass.achievedPercent).toBeCloseTo(3.9, 12);
    expect(pass.pass).toBe(true);
    expect(pass.slope).toBeNull();
    const fail = computeAccuracyTest(
      { method: "flow", foamClass: "B", ratedPercent: 3, concentrateGal: 2.95, waterGal: 97.05 },
      0.3,
    );
    expect(fail.pass).toBe(false);
  });

  it("Class A uses the agency's share either side of the rated percentage (no published figure)", () => {
    expect(accuracyBand("A", 0.5, 0.3)).toEqual([0.35, 0.65]);
    expect(accuracyBand("A", 0.5, 0.2)).toEqual([0.4, 0.6]);
  });
});

describe("the compute request", () => {
  const fieldsOf = (body: unknown) => {
    const parsed = AccuracyTestInputSchema.safeParse(body);
    expect(parsed.success).toBe(false);
    return parsed.error!.issues.map((issue) => issue.path.join("."));
  };

  it("refuses fewer than two calibration points", () => {
    expect(
      fieldsOf({
        method: "refractometer",
        foamClass: "B",
        ratedPercent: 3,
        calibration: [{ percent: 3, reading: 1 }],
        sampleReading: 1,
      }),
    ).toContain("calibration");
  });

  it("refuses readings that are all equal", () => {
    expect(
      fieldsOf({
        method: "conductivity",
        foamClass: "B",
        ratedPercent: 3,
        calibration: [
          { percent: 0, reading: 5 },
          { percent: 3, reading: 5 },
        ],
        sampleReading: 5,
      }),
    ).toContain("calibration");
  });

  it("refuses negatives at their fields", () => {
    expect(
      fieldsOf({
        method: "refractometer",
        foamClass: "B",
        ratedPercent: 3,
        calibration: [
          { percent: -1, reading: 0 },
          { percent: 3, reading: 1 },
        ],
        sampleReading: -2,
      }),
    ).toEqual(expect.arrayContaining(["calibration.0.percent", "sampleReading"]));
    expect(fieldsOf({ method: "flow", foamClass: "B", ratedPercent: 3, concentrateGal: -1, waterGal: 10 })).toContain(
      "concentrateGal",
    );
  });

  // reading = 2 × percent + 1: 1 reads as 0 %, 201 as 100 %.
  const curve = (overrides: Record<string, unknown> = {}) => ({
    method: "refractometer",
    foamClass: "B",
    ratedPercent: 3,
    calibration: [
      { percent: 0, reading: 1 },
      { percent: 3, reading: 7 },
      { percent: 6, reading: 13 },
    ],
    sampleReading: 7,
    ...overrides,
  });
  const flow = (overrides: Record<string, unknown> = {}) => ({
    method: "flow",
    foamClass: "B",
    ratedPercent: 3,
    concentrateGal: 3,
    waterGal: 97,
    ...overrides,
  });
  const messagesOf = (body: unknown) => {
    const parsed = AccuracyTestInputSchema.safeParse(body);
    expect(parsed.success).toBe(false);
    return Object.fromEntries(parsed.error!.issues.map((issue) => [issue.path.join("."), issue.message]));
  };

  it("takes the edges of every bound", () => {
    expect(AccuracyTestInputSchema.safeParse(curve({ ratedPercent: 10 })).success).toBe(true);
    expect(AccuracyTestInputSchema.safeParse(flow({ ratedPercent: 0.1 })).success).toBe(true);
    const edges = curve({
      calibration: [
        { percent: 0, reading: 1 },
        { percent: 100, reading: 201 },
      ],
    });
    expect(AccuracyTestInputSchema.safeParse({ ...edges, sampleReading: 1 }).success).toBe(true);
    expect(AccuracyTestInputSchema.safeParse({ ...edges, sampleReading: 201 }).success).toBe(true);
    expect(AccuracyTestInputSchema.safeParse(flow({ concentrateGal: 10_000, waterGal: 1_000_000 })).success).toBe(true);
  });

  it("refuses a rated percent of 0 or above 10 at its field", () => {
    expect(messagesOf(flow({ ratedPercent: 0 }))).toEqual({ ratedPercent: "The rated percent must be more than 0." });
    expect(messagesOf(curve({ ratedPercent: 10.01 }))).toEqual({
      ratedPercent: "The rated percent must be at most 10.",
    });
    expect(messagesOf(flow({ ratedPercent: 99 }))).toEqual({ ratedPercent: "The rated percent must be at most 10." });
  });

  it("refuses a calibration mix above 100 % and readings above 1,000,000", () => {
    expect(
      messagesOf(
        curve({
          calibration: [
            { percent: 0, reading: 1 },
            { percent: 900_000, reading: 2 },
          ],
        }),
      ),
    ).toEqual({ "calibration.1.percent": "The calibration percent must be at most 100." });
    expect(
      messagesOf(
        curve({
          calibration: [
            { percent: 0, reading: 1 },
            { percent: 3, reading: 1_000_001 },
          ],
          sampleReading: 2_000_000,
        }),
      ),
    ).toEqual({
      "calibration.1.reading": "The calibration reading must be at most 1,000,000.",
      sampleReading: "The sample reading must be at most 1,000,000.",
    });
  });

  it("refuses a flow test's volumes of 0 or past their bounds", () => {
    expect(messagesOf(flow({ concentrateGal: 0, waterGal: 1_000_001 }))).toEqual({
      concentrateGal: "The concentrate drawn (gal) must be more than 0.",
      waterGal: "The metered water (gal) must be at most 1,000,000.",
    });
    expect(messagesOf(flow({ concentrateGal: 10_001 }))).toEqual({
      concentrateGal: "The concentrate drawn (gal) must be at most 10,000.",
    });
  });

  it("refuses NaN, Infinity and numbers sent as text at their fields", () => {
    expect(Object.keys(messagesOf(flow({ concentrateGal: Number.NaN, waterGal: Infinity })))).toEqual([
      "concentrateGal",
      "waterGal",
    ]);
    expect(messagesOf(curve({ sampleReading: -Infinity, ratedPercent: "3" }))).toEqual({
      ratedPercent: "Enter the rated percent as a number.",
      sampleReading: "Enter the sample reading as a number.",
    });
  });

  it("refuses a sample that reads back below 0 % or above 100 % of solution", () => {
    expect(messagesOf(curve({ sampleReading: 0.5 })).sampleReading).toMatch(/less than 0 % of solution/);
    expect(messagesOf(curve({ sampleReading: 201.5 })).sampleReading).toMatch(/more than 100 % of solution/);
    expect(messagesOf(curve({ sampleReading: 999_999 })).sampleReading).toMatch(/more than 100 % of solution/);
  });

  it("refuses a calibration too flat to read a sample through, never answering NaN or Infinity", () => {
    // Mixes 0 % and 1e-300 % differ, but the line's slope overflows.
    expect(
      messagesOf(
        curve({
          calibration: [
            { percent: 0, reading: 1 },
            { percent: 1e-300, reading: 2 },
          ],
          sampleReading: 1.5,
        }),
      ),
    ).toEqual({
      calibration: "The calibration mixes do not give a line to read the sample through: check the readings.",
    });
    // Readings that differ by next to nothing give a slope that reads the sample far past 100 %.
    expect(
      messagesOf(
        curve({
          calibration: [
            { percent: 0, reading: 1e-300 },
            { percent: 3, reading: 2e-300 },
          ],
          sampleReading: 1,
        }),
      ).sampleReading,
    ).toMatch(/more than 100 %/);
  });

  it("refuses more calibration mixes than the form holds", () => {
    const many = Array.from({ length: MAX_CALIBRATION_POINTS + 1 }, (_, index) => ({
      percent: index / 4,
      reading: 1 + index / 2,
    }));
    expect(messagesOf(curve({ calibration: many, sampleReading: 2 }))).toEqual({
      calibration: `Enter at most ${MAX_CALIBRATION_POINTS} calibration mixes.`,
    });
  });
});
