// Manual check (not part of npm test): do LibreOffice Calc's own results for every formula in our
// workbooks equal the values we cache in them? Each file is copied with every cached formula value
// replaced by 999999, opened headless by LibreOffice with "always recalculate" set in a throwaway
// profile and saved as ODS; SheetJS then compares LibreOffice's results with the original cached values.
//   node --import tsx scripts/check-workbook-libreoffice.ts foam-runoff-summary_2026-Q1.xlsx [...]
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, writeFileSync, mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import XLSX from "xlsx";

const files = process.argv.slice(2);
if (files.length === 0) {
  console.error("Give one or more .xlsx files.");
  process.exit(2);
}
const office = spawnSync("libreoffice", ["--version"], { encoding: "utf8" });
if (office.status !== 0) {
  console.error("LibreOffice is not installed (apt-get install -y libreoffice-calc).");
  process.exit(2);
}

const work = mkdtempSync(path.join(tmpdir(), "foamtally-lo-"));
const profile = path.join(work, "profile");
mkdirSync(path.join(profile, "user"), { recursive: true });
writeFileSync(
  path.join(profile, "user", "registrymodifications.xcu"),
  `<?xml version="1.0" encoding="UTF-8"?>
<oor:items xmlns:oor="http://openoffice.org/2001/registry" xmlns:xs="http://www.w3.org/2001/XMLSchema" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance">
<item oor:path="/org.openoffice.Office.Calc/Formula/Load"><prop oor:name="OOXMLRecalcMode" oor:op="fuse"><value>0</value></prop></item>
</oor:items>
`,
);

let failures = 0;
try {
  for (const [index, file] of files.entries()) {
    const original = readFileSync(file);
    const zip = XLSX.CFB.read(original, { type: "buffer" });
    let tampered = 0;
    for (const entry of zip.FileIndex) {
      if (!/^sheet\d+\.xml$/.test(entry.name) || !entry.content) continue;
      const xml = Buffer.from(entry.content as Uint8Array).toString("utf8");
      const changed = xml.replace(/(<f>[^<]*<\/f>)<v>[^<]*<\/v>/g, (_, formula: string) => {
        tampered++;
        return `${formula}<v>999999</v>`;
      });
      entry.content = Buffer.from(changed, "utf8");
      entry.size = entry.content.length;
    }
    const copy = path.join(work, `copy-${index}.xlsx`);
    writeFileSync(copy, XLSX.CFB.write(zip, { fileType: "zip", type: "buffer" }) as Buffer);
    const run = spawnSync(
      "libreoffice",
      [`-env:UserInstallation=file://${profile}`, "--headless", "--convert-to", "ods", "--outdir", work, copy],
      { encoding: "utf8", timeout: 180_000 },
    );
    if (run.status !== 0) throw new Error(`LibreOffice could not open ${file}: ${run.stderr}`);
    const ours = XLSX.read(original, { cellFormula: true });
    const theirs = XLSX.readFile(path.join(work, `copy-${index}.ods`));
    let checked = 0;
    let wrong = 0;
    for (const name of ours.SheetNames) {
      const sheet = ours.Sheets[name];
      for (const [address, cell] of Object.entries(sheet)) {
        if (address.startsWith("!") || !(cell as XLSX.CellObject).f) continue;
        checked++;
        const cached = (cell as XLSX.CellObject).v;
        const computed = theirs.Sheets[name]?.[address]?.v;
        const same =
          typeof cached === "number"
            ? typeof computed === "number" && Math.abs(computed - cached) <= 1e-9 * Math.max(1, Math.abs(cached))
            : computed === cached;
        if (!same) {
          wrong++;
          console.log(`  ${name}!${address} ${(cell as XLSX.CellObject).f}: cached ${cached}, LibreOffice ${computed}`);
        }
      }
    }
    console.log(
      `${file}: ${checked} formulas (${tampered} cached values blanked), ${wrong} differ from LibreOffice's results`,
    );
    if (wrong > 0 || checked === 0) failures++;
  }
} finally {
  rmSync(work, { recursive: true, force: true });
}
process.exit(failures > 0 ? 1 : 0);
