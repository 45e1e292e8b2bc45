// Invented files for the demo's attachments and for the tests: photos drawn here (a coloured field
// with a label, never a real scene) and one-page PDFs, each plainly marked as demo data.
import sharp from "sharp";
import { demoSheetPdf } from "../seeds/06_safety_sheets";

export type DemoPhotoOptions = {
  /** Printed on the picture: what it pretends to show. */
  label: string;
  background?: string;
  width?: number;
  height?: number;
  /** A camera name and a GPS position in the file's EXIF, as a phone would write them. */
  exif?: { latitude: number; longitude: number; camera?: string };
};

function degreesMinutesSeconds(value: number): string {
  const absolute = Math.abs(value);
  const degrees = Math.floor(absolute);
  const minutesFloat = (absolute - degrees) * 60;
  const minutes = Math.floor(minutesFloat);
  const seconds = Math.round((minutesFloat - minutes) * 60 * 100);
  return `${degrees}/1 ${minutes}/1 ${seconds}/100`;
}

const escapeXml = (text: string) =>
  text.replace(/[<>&"]/g, (c) => ({ "<": "&lt;", ">": "&gt;", "&": "&amp;", '"': "&quot;" })[c]!);

/** A JPEG "photo": a field of colour with stripes and its label, marked DEMO. */
export async function demoPhotoJpeg(options: DemoPhotoOptions): Promise<Buffer> {
  const width = options.width ?? 640;
  const height = options.height ?? 480;
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}">
    <rect width="100%" height="100%" fill="${options.background ?? "#4b6b3c"}"/>
    <rect y="${height * 0.62}" width="100%" height="${height * 0.38}" fill="#6b5a3c" opacity="0.7"/>
    <rect x="${width * 0.1}" y="${height * 0.55}" width="${width * 0.5}" height="${height * 0.12}" fill="#f2f2e8" opacity="0.85"/>
    <text x="24" y="48" font-family="sans-serif" font-size="32" font-weight="bold" fill="#fff">DEMO PHOTO</text>
    <text x="24" y="88" font-family="sans-serif" font-size="22" fill="#fff">${escapeXml(options.label)}</text>
    <text x="24" y="${height - 24}" font-family="sans-serif" font-size="16" fill="#fff">Invented for the Alder Bend demo</text>
  </svg>`;
  let image = sharp(Buffer.from(svg)).jpeg({ quality: 80 });
  if (options.exif) {
    const { latitude, longitude, camera } = options.exif;
    image = image.withExif({
      IFD0: { Make: "Demo", Model: camera ?? "Demo Camera 1" },
      IFD3: {
        GPSLatitudeRef: latitude >= 0 ? "N" : "S",
        GPSLatitude: degreesMinutesSeconds(latitude),
        GPSLongitudeRef: longitude >= 0 ? "E" : "W",
        GPSLongitude: degreesMinutesSeconds(longitude),
      },
    });
  }
  return image.toBuffer();
}

/** A one-page PDF whose first line says it is demo data. */
export function demoDocumentPdf(title: string, lines: string[]): Uint8Array {
  return demoSheetPdf([`DEMO DATA - ${title}`, "Invented for the Alder Bend demo; not a real record.", "", ...lines]);
}
