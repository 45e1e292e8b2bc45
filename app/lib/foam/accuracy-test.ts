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

const bounded = (label: string, { min, max, minIncluded }: { min: number; max: number; minIncluded: boolean }) =>
  z
    .number({ error: `Enter the ${label} as a number.` })
    .refine(Number.isFinite, `Enter the ${label} as a number.`)
    .refine(
      (value) => (minIncluded ? value >= min : value > min),
      minIncluded && min === 0 ? `The ${label} cannot be negative.` : `The ${label} must be more than ${min}.`,
    )
    .refine((value) => value <= max, `The ${label} must be at most ${max.toLocaleString("en-US")}.`);

const nonNegative = (label: string, max: number) => bounded(label, { min: 0, max, minIncluded: true });
const positive = (label: string, max: number) => bounded(label, { min: 0, max, minIncluded: false });

/**
 * Foam concentrates are proportioned at 0.1–1 % (Class A) and 1, 3 or 6 % (Class B) of solution
 * (from memory); 10 % leaves room for any listed product while refusing a figure that is no rating.
 */
export const MAX_RATED_PERCENT = 10;
/** Instrument readings: a refractometer's scale or a conductivity meter's µS/cm (common practice, no source). */
export const MAX_READING = 1_000_000;
export const MAX_CALIBRATION_POINTS = 20;

const foamClass = z.enum(FOAM_CLASSES, { error: "Choose Class A or Class B." });
const ratedPercent = positive("rated percent", MAX_RATED_PERCENT);

const calibration = z
  .array(
    z.object({
      // A known mix is a share of foam solution, so 0 (plain water) to 100 (concentrate alone).
      percent: nonNegative("calibration percent", 100),
      reading: nonNegative("calibration reading", MAX_READING),
    }),
    { error: "Send the calibration mixes as a list of { percent, reading }." },
  )
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

const sampleReading = nonNegative("sample reading", MAX_READING);

/**
 * The sample read back through the calibration line must be a share of solution, 0 to 100 %; a
 * line too flat to read anything back (readings or mixes that differ by next to nothing) is refused
 * at the calibration. Checked only once the mixes and the sample are each within their bounds.
 */
function checkReadBack(test: { calibration?: unknown; sampleReading?: unknown }, ctx: z.RefinementCtx) {
  const points = calibration.safeParse(test.calibration);
  const sample = sampleReading.safeParse(test.sampleReading);
  if (!points.success || !sample.success) return;
  const fit = fitCalibration(points.data);
  if (!Number.isFinite(fit.slope) || !Number.isFinite(fit.intercept) || fit.slope === 0) {
    ctx.addIssue({
      code: "custom",
      path: ["calibration"],
      message: "The calibration mixes do not give a line to read the sample through: check the readings.",
    });
    return;
  }
  const achieved = (sample.data - fit.intercept) / fit.slope;
  if (Number.isFinite(achieved) && achieved >= 0 && achieved <= 100) return;
  ctx.addIssue({
    code: "custom",
    path: ["sampleReading"],
    message: `The sample reading lies outside what the calibration mixes can tell: through their line it reads as ${
      achieved < 0 ? "less than 0 %" : "more than 100 %"
    } of solution. Check the readings.`,
  });
}

export const CurveTestSchema = z
  .object({
    method: z.enum(["refractometer", "conductivity"]),
    foamClass,
    ratedPercent,
    calibration,
    sampleReading,
  })
  .superRefine(checkReadBack);

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
