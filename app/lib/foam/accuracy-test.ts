import { z } from "zod";
import { usualPercentRange } from "./totals";
import { FOAM_CLASSES, type FoamClass } from "./vocabulary";

/**
 * Proportioner accuracy tests. A refractometer or conductivity test reads known mixes (percent of
 * solution, e.g. 0, half, rated and twice rated), fits reading = slope × percent + intercept by least
 * squares, and reads the discharge sample back through the line. A flow test divides the concentrate
 * drawn from a calibrated container by the solution it made with the metered water. Both give the
 * achieved percentage of foam solution (NFPA 11 (2021) §12.6.5 states the rate as a share of solution).
 */

export type CalibrationPoint = { percent: number; reading: number };

export type LineFit = { slope: number; intercept: number; r2: number };

/** Ordinary least squares of reading on percent, with the coefficient of determination. */
export function fitCalibration(points: readonly CalibrationPoint[]): LineFit {
  const n = points.length;
  const meanX = points.reduce((sum, point) => sum + point.percent, 0) / n;
  const meanY = points.reduce((sum, point) => sum + point.reading, 0) / n;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (const { percent, reading } of points) {
    sxx += (percent - meanX) ** 2;
    sxy += (percent - meanX) * (reading - meanY);
    syy += (reading - meanY) ** 2;
  }
  const slope = sxy / sxx;
  const intercept = meanY - slope * meanX;
  let residual = 0;
  for (const { percent, reading } of points) residual += (reading - (slope * percent + intercept)) ** 2;
  return { slope, intercept, r2: syy === 0 ? 0 : 1 - residual / syy };
}

/**
 * The band an achieved percentage must fall in. Class B: NFPA 11 (2021) §12.6.5 — not less than the
 * rated percentage, nor more than 30 % above it or 1 point above it, whichever is less (the same rule
 * the usage checks use, `usualPercentRange`). Class A: no published figure was found; the agency's
 * setting gives a share either side of the rated percentage.
 */
export function accuracyBand(foamClass: FoamClass, ratedPercent: number, classAShare: number): [number, number] {
  if (foamClass === "B") {
    const [low, high] = usualPercentRange("B", [ratedPercent])[0];
    return [low, Number(high.toFixed(6))];
  }
  return [Number((ratedPercent * (1 - classAShare)).toFixed(6)), Number((ratedPercent * (1 + classAShare)).toFixed(6))];
}

/** Achieved percentages are kept to five decimals; the band is checked on the kept figure. */
export const ACHIEVED_PLACES = 5;

export function withinBand(achievedPercent: number, [low, high]: readonly [number, number]): boolean {
  const kept = Number(achievedPercent.toFixed(ACHIEVED_PLACES));
  return kept >= low && kept <= high;
}

const nonNegative = (label: string) =>
  z
    .number({ error: `Enter the ${label} as a number.` })
    .refine(Number.isFinite, `Enter the ${label} as a number.`)
    .refine((value) => value >= 0, `The ${label} cannot be negative.`)
    .refine((value) => value <= 1_000_000, `The ${label} must be at most 1,000,000.`);

const positive = (label: string, max: number) =>
  z
    .number({ error: `Enter the ${label} as a number.` })
    .refine(Number.isFinite, `Enter the ${label} as a number.`)
    .refine((value) => value > 0, `The ${label} must be more than 0.`)
    .refine((value) => value <= max, `The ${label} must be at most ${max.toLocaleString("en-US")}.`);

const foamClass = z.enum(FOAM_CLASSES, { error: "Choose Class A or Class B." });
const ratedPercent = positive("rated percent", 99);

export const MAX_CALIBRATION_POINTS = 20;

const calibration = z
  .array(z.object({ percent: nonNegative("calibration percent"), reading: nonNegative("calibration reading") }), {
    error: "Send the calibration mixes as a list of { percent, reading }.",
  })
  .min(2, "Enter at least two calibration mixes.")
  .max(MAX_CALIBRATION_POINTS, `Enter at most ${MAX_CALIBRATION_POINTS} calibration mixes.`)
  .superRefine((points, ctx) => {
    if (points.length < 2) return;
    if (points.every((point) => point.reading === points[0].reading)) {
      ctx.addIssue({
        code: "custom",
        message: "All calibration readings are equal: the instrument does not tell the mixes apart.",
      });
    }
    if (points.every((point) => point.percent === points[0].percent)) {
      ctx.addIssue({ code: "custom", message: "The calibration mixes need at least two different percentages." });
    }
  });

export const CurveTestSchema = z.object({
  method: z.enum(["refractometer", "conductivity"]),
  foamClass,
  ratedPercent,
  calibration,
  sampleReading: nonNegative("sample reading"),
});

export const FlowTestSchema = z.object({
  method: z.literal("flow"),
  foamClass,
  ratedPercent,
  concentrateGal: positive("concentrate drawn (gal)", 10_000),
  waterGal: positive("metered water (gal)", 1_000_000),
});

/** The body of `POST /api/foam-tests/compute`, and the readings part of a recorded test. */
export const AccuracyTestInputSchema = z.discriminatedUnion("method", [CurveTestSchema, FlowTestSchema], {
  error: "Choose the method: refractometer, conductivity or flow.",
});
export type AccuracyTestInput = z.infer<typeof AccuracyTestInputSchema>;

export type AccuracyTestResult = {
  achievedPercent: number;
  slope: number | null;
  intercept: number | null;
  r2: number | null;
  band: [number, number];
  pass: boolean;
};

/** The achieved percentage of solution, the fit, the band and the verdict for one test's readings. */
export function computeAccuracyTest(input: AccuracyTestInput, classAShare: number): AccuracyTestResult {
  const band = accuracyBand(input.foamClass, input.ratedPercent, classAShare);
  if (input.method === "flow") {
    const achievedPercent = (input.concentrateGal / (input.concentrateGal + input.waterGal)) * 100;
    return { achievedPercent, slope: null, intercept: null, r2: null, band, pass: withinBand(achievedPercent, band) };
  }
  const fit = fitCalibration(input.calibration);
  const achievedPercent = (input.sampleReading - fit.intercept) / fit.slope;
  return { achievedPercent, ...fit, band, pass: withinBand(achievedPercent, band) };
}
