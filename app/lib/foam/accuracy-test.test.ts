import { linearRegression, linearRegressionLine, rSquared } from "simple-statistics";
import { describe, expect, it } from "vitest";
import {
  accuracyBand,
  AccuracyTestInputSchema,
  computeAccuracyTest,
  fitCalibration,
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
});
