import type { Knex } from "knex";
import { putObject, StorageUnavailableError } from "../app/lib/storage.server";

// Demo data only: a one-page placeholder sheet per invented concentrate, so that the catalogue's
// safety-sheet links work in the demo. It is plainly not a real safety data sheet.

/** A minimal single-page PDF (PDF 1.4, Helvetica) with the given lines of text. */
export function demoSheetPdf(lines: string[]): Uint8Array {
  const escape = (text: string) => text.replace(/[\\()]/g, (match) => `\\${match}`).replace(/[^\x20-\x7e]/g, "-");
  const content = ["BT", "/F1 12 Tf", "14 TL", "72 760 Td", ...lines.map((line) => `(${escape(line)}) '`), "ET"].join(
    "\n",
  );
  const objects = [
    "<< /Type /Catalog /Pages 2 0 R >>",
    "<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
    "<< /Type /Page /Parent 2 0 R /MediaBox [0 0 612 792] /Contents 4 0 R /Resources << /Font << /F1 5 0 R >> >> >>",
    `<< /Length ${content.length} >>\nstream\n${content}\nendstream`,
    "<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>",
  ];
  let pdf = "%PDF-1.4\n";
  const offsets = objects.map((object, index) => {
    const offset = pdf.length;
    pdf += `${index + 1} 0 obj\n${object}\nendobj\n`;
    return offset;
  });
  const xref = pdf.length;
  pdf += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n`;
  pdf += offsets.map((offset) => `${String(offset).padStart(10, "0")} 00000 n \n`).join("");
  pdf += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return new TextEncoder().encode(pdf);
}

export async function seed(knex: Knex): Promise<void> {
  const products = await knex("foam_products").whereNull("safety_sheet_key").where("name", "like", "%(demo%");
  for (const product of products) {
    const key = `safety-sheets/demo-${product.id}.pdf`;
    const body = demoSheetPdf([
      `DEMO DATA - placeholder safety sheet for "${product.name}"`,
      "This product is invented for the Alder Bend demo. This is not a safety data sheet.",
      "A real catalogue keeps the manufacturer's current SDS here.",
      product.pfas_containing
        ? "Marked PFAS-containing: contain, collect and report releases as local law requires."
        : "",
    ]);
    try {
      await putObject(key, body, "application/pdf");
    } catch (error) {
      if (!(error instanceof StorageUnavailableError)) throw error;
      console.log("The file store is not running; demo safety sheets were not added.");
      return;
    }
    await knex("foam_products")
      .where({ id: product.id })
      .update({
        safety_sheet_key: key,
        safety_sheet_name: `${product.name.replace(/[^A-Za-z0-9]+/g, "-").replace(/^-|-$/g, "")}-demo-sheet.pdf`,
      });
  }
}
