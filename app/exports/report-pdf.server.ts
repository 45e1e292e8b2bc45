import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import fontkit from "@pdf-lib/fontkit";
import { PDFDocument, type PDFFont, type PDFPage, rgb } from "pdf-lib";
import {
  dischargeUnitLabel,
  DISPOSITION_LABELS,
  EVENT_KIND_LABELS,
  FOAM_CLASS_LABELS,
  incidentTypeLabel,
} from "~/lib/foam/vocabulary";
import { hundredBlock, type RedactionChoices, roundCoordinate, WITHHELD } from "~/lib/records/redaction";
import type { ReportDetail } from "~/models/event-read.server";

const require = createRequire(import.meta.url);
let fonts: { regular: Uint8Array; bold: Uint8Array } | null = null;

// The bundled Public Sans (the app's own typeface), as WOFF files from @fontsource/public-sans.
function fontBytes() {
  fonts ??= {
    regular: readFileSync(require.resolve("@fontsource/public-sans/files/public-sans-latin-400-normal.woff")),
    bold: readFileSync(require.resolve("@fontsource/public-sans/files/public-sans-latin-700-normal.woff")),
  };
  return fonts;
}

const PAGE = { width: 612, height: 792, margin: 54 }; // US Letter in points

/** Lines of text on pages, wrapping and breaking pages as needed. */
export class PdfWriter {
  private page!: PDFPage;
  private y = 0;
  private constructor(
    readonly document: PDFDocument,
    private readonly regular: PDFFont,
    private readonly bold: PDFFont,
  ) {
    this.newPage();
  }

  static async create(title: string): Promise<PdfWriter> {
    const document = await PDFDocument.create();
    document.registerFontkit(fontkit);
    document.setTitle(title);
    document.setProducer("Foamtally");
    document.setCreationDate(new Date(0));
    const bytes = fontBytes();
    const regular = await document.embedFont(bytes.regular, { subset: true });
    const bold = await document.embedFont(bytes.bold, { subset: true });
    return new PdfWriter(document, regular, bold);
  }

  private newPage() {
    this.page = this.document.addPage([PAGE.width, PAGE.height]);
    this.y = PAGE.height - PAGE.margin;
  }

  private wrap(text: string, font: PDFFont, size: number): string[] {
    const width = PAGE.width - 2 * PAGE.margin;
    const lines: string[] = [];
    for (const paragraph of text.split("\n")) {
      let line = "";
      for (const word of paragraph.split(/\s+/)) {
        const candidate = line ? `${line} ${word}` : word;
        if (font.widthOfTextAtSize(candidate, size) > width && line) {
          lines.push(line);
          line = word;
        } else line = candidate;
      }
      lines.push(line);
    }
    return lines;
  }

  text(text: string, options: { size?: number; bold?: boolean; gap?: number } = {}) {
    const size = options.size ?? 10;
    const font = options.bold ? this.bold : this.regular;
    // Characters outside the embedded Latin subset are replaced, never dropped silently.
    const safe = [...text]
      .map((character) =>
        font.getCharacterSet().includes(character.codePointAt(0)!) || character === "\n" ? character : "?",
      )
      .join("");
    for (const line of this.wrap(safe, font, size)) {
      if (this.y < PAGE.margin + size) this.newPage();
      this.page.drawText(line, { x: PAGE.margin, y: this.y - size, size, font, color: rgb(0.1, 0.12, 0.15) });
      this.y -= size * 1.35;
    }
    this.y -= options.gap ?? 2;
  }

  heading(text: string) {
    this.text(text, { size: 13, bold: true, gap: 4 });
  }

  async bytes(): Promise<Uint8Array> {
    return this.document.save({ useObjectStreams: false });
  }
}

const gallons = (value: number | null) =>
  value === null ? "—" : `${value.toLocaleString("en-US", { maximumFractionDigits: 1 })} gal`;

/** The standard cautions printed on every usage report (the product's own wording). */
export const REPORT_CAUTIONS = [
  "Volumes are computed from the flows, times and proportioning the crew recorded; they are estimates, not meter readings.",
  "A record kept here is not a notification to any agency: release reporting duties are met by notice to the agencies named by law.",
];

/** A notification record as the printed report shows it (who was told, when, the case number). */
export type PrintedNotification = {
  partyLabel: string;
  partyDetail: string;
  notifiedAt: string;
  notifiedBy: string;
  caseNumber: string;
};

/**
 * The printable usage report, as a chief prints it from the event page; with `redact`, the same
 * document with the chosen parts left out (for a public-records release).
 */
export async function usageReportPdf(
  report: NonNullable<ReportDetail>,
  agencyName: string,
  redact: RedactionChoices | null = null,
  notifications: readonly PrintedNotification[] = [],
): Promise<Uint8Array> {
  const writer = await PdfWriter.create(`Usage report ${report.number}`);
  const location = redact?.locations
    ? {
        address: report.address ? hundredBlock(report.address) : "",
        latitude: roundCoordinate(report.latitude),
        longitude: roundCoordinate(report.longitude),
      }
    : { address: report.address, latitude: report.latitude, longitude: report.longitude };
  writer.text(agencyName, { size: 10, bold: true });
  writer.text(`Foam-usage report ${report.number}`, { size: 16, bold: true, gap: 6 });
  writer.text(
    `Kind: ${EVENT_KIND_LABELS[report.kind]} · type: ${incidentTypeLabel(report.incidentType)} · dispatch (CAD) number: ${report.dispatchNumber ?? "—"} · Revision ${report.revision}`,
  );
  writer.text(
    `Started ${report.startedAt.replace("T", " ")} · cleared ${report.clearedAt.replace("T", " ") || "—"} (${report.timeZone})`,
  );
  writer.text(`Station: ${report.station ?? "—"}`);
  writer.text(`Location: ${location.address || "—"}`);
  writer.text(
    `Coordinates: ${location.latitude ?? "—"}, ${location.longitude ?? "—"} · drainage basin: ${report.geography.drainageBasin ?? "—"}`,
    { gap: 8 },
  );
  if (!redact?.personnel) {
    writer.text(`Filed by: ${report.authorName ?? "—"} · reviewed by: ${report.reviewerName ?? "—"}`, { gap: 8 });
  }
  writer.heading("Totals");
  writer.text(
    `Water ${gallons(report.totals.water)} · concentrate ${gallons(report.totals.concentrate)} · solution ${gallons(report.totals.solution)}`,
    { gap: 8 },
  );
  writer.heading("Discharges");
  for (const line of report.discharges) {
    writer.text(
      `${line.position}. ${dischargeUnitLabel(line) ?? "—"} ${line.outlet} · ${line.product ?? "water only"}${line.foamClass ? ` (${FOAM_CLASS_LABELS[line.foamClass]})` : ""} · ` +
        `${line.flow} ${line.flowUnit} on ${line.basis} for ${line.minutes} min at ${line.percent ?? 0} % (effective ${line.effectivePercent ?? "—"} %) → ` +
        `water ${gallons(line.water)}, concentrate ${gallons(line.concentrate)}, solution ${gallons(line.solution)}`,
    );
    for (const warning of line.warnings) writer.text(`   Warning: ${warning.message}`);
  }
  writer.heading("Runoff");
  for (const line of report.dispositions) {
    writer.text(
      `${DISPOSITION_LABELS[line.disposition]}: ${line.sharePercent ?? "—"} % · released ${gallons(line.releasedGal)}` +
        (line.receivingWater ? ` · receiving water ${line.receivingWater}` : ""),
    );
  }
  if (report.eventWarnings.length) {
    writer.heading("Warnings");
    for (const warning of report.eventWarnings) writer.text(warning.message);
  }
  writer.heading("Notifications of this release");
  if (notifications.length === 0) writer.text("None recorded.");
  for (const entry of notifications) {
    writer.text(
      `${entry.partyLabel}${entry.partyDetail ? ` (${entry.partyDetail})` : ""} · ${entry.notifiedAt.replace("T", " ")}` +
        (redact?.personnel ? "" : ` · by ${entry.notifiedBy}`) +
        (entry.caseNumber ? ` · case ${entry.caseNumber}` : ""),
    );
  }
  writer.heading("Notes");
  writer.text(redact?.notes ? WITHHELD : report.narrative || "—");
  if (!redact?.notes && report.reviewComment) writer.text(`Review comment: ${report.reviewComment}`);
  writer.heading("Cautions");
  for (const caution of REPORT_CAUTIONS) writer.text(caution, { size: 9 });
  return writer.bytes();
}
