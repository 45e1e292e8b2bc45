import {
  ACCURACY_TEST_METHOD_LABELS,
  FOAM_CLASS_LABELS,
  FOAM_SYSTEM_TYPE_LABELS,
  type FoamSystemType,
} from "~/lib/foam/vocabulary";
import type { AccuracyTestRecord } from "~/models/foam-system.server";
import { PdfWriter } from "./report-pdf.server";

export type PrintedAccuracyTest = AccuracyTestRecord & {
  systemName: string;
  systemType: FoamSystemType;
  apparatus: string;
  agencyName: string;
  classAAccuracyShare: number;
  /** Printouts attached to the test (kept in the object store, named here so the paper points to them). */
  printouts: Array<{ name: string; /** local wall-clock time */ uploadedAt: string }>;
};

const percent = (value: number, places = 3) => `${Number(value.toFixed(places))} %`;

/** The printable record of one proportioner accuracy test. */
export async function accuracyTestPdf(test: PrintedAccuracyTest): Promise<Uint8Array> {
  const writer = await PdfWriter.create(`Accuracy test ${test.apparatus} ${test.systemName} ${test.testedAt}`);
  writer.text(test.agencyName, { bold: true });
  writer.heading(`Proportioner accuracy test — ${test.apparatus} · ${test.systemName}`);
  writer.text(`System: ${FOAM_SYSTEM_TYPE_LABELS[test.systemType]}`);
  writer.text(`Tested: ${test.testedAt.replace("T", " ")} by ${test.testedBy}`);
  writer.text(`Method: ${ACCURACY_TEST_METHOD_LABELS[test.method]}`);
  writer.text(
    `Foam: ${FOAM_CLASS_LABELS[test.foamClass]}${test.product ? `, ${test.product}` : ""}; rated ${percent(test.ratedPercent)}` +
      (test.setPercent != null ? `; set ${percent(test.setPercent)}` : "") +
      (test.waterFlowGpm != null ? `; water flow ${test.waterFlowGpm} gpm` : ""),
    { gap: 8 },
  );
  writer.heading("Readings");
  const readings = test.readings;
  if (readings.method === "flow") {
    writer.text(`Concentrate drawn from the calibrated container: ${readings.concentrateGal} gal`);
    writer.text(`Metered water over the same interval: ${readings.waterGal} gal`, { gap: 8 });
  } else {
    for (const point of readings.calibration)
      writer.text(`Known mix ${percent(point.percent)}: reading ${point.reading}`);
    writer.text(`Discharge sample: reading ${readings.sampleReading}`);
    writer.text(
      `Least-squares line: reading = ${test.slope?.toPrecision(6)} × percent + ${test.intercept?.toPrecision(6)}; R² = ${test.r2?.toFixed(5)}`,
      { gap: 8 },
    );
  }
  writer.heading("Result");
  writer.text(`Achieved: ${percent(test.achievedPercent)} of foam solution`);
  writer.text(`Band: ${percent(test.band[0])} to ${percent(test.band[1])}`);
  writer.text(`Verdict: ${test.pass ? "PASS" : "FAIL — the system is out of tolerance until a passing retest"}`, {
    bold: true,
    gap: 8,
  });
  writer.text(
    test.foamClass === "B"
      ? "Band: NFPA 11 (2021) §12.6.5 — not less than the rated percentage, nor more than 30 % above it or 1 percentage point above it, whichever is less."
      : `Band: the agency's Class A setting, ± ${Number((test.classAAccuracyShare * 100).toFixed(2))} % of the rated percentage. No published figure for Class A apparatus systems was found.`,
    { size: 9 },
  );
  if (test.notes) writer.text(`Notes: ${test.notes}`, { size: 9 });
  writer.heading("Attached printouts");
  if (test.printouts.length === 0) writer.text("None attached.", { gap: 8 });
  else {
    for (const printout of test.printouts)
      writer.text(`${printout.name} (attached ${printout.uploadedAt.replace("T", " ")})`, { size: 9 });
    writer.text("The printouts are kept with the test record in Foamtally.", { size: 9, gap: 8 });
  }
  writer.text("Signature of tester: ______________________________", { gap: 4 });
  return writer.bytes();
}
