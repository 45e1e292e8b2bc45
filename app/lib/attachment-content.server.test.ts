import { mkdtemp, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import path from "node:path";
import exifr from "exifr";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoDocumentPdf, demoPhotoJpeg } from "../../scripts/demo-files";
import { readPhotoPosition, sniffBytes, sniffFile, thumbnailOf, writeCleanImage } from "./attachment-content.server";

let directory: string;
beforeAll(async () => {
  directory = await mkdtemp(path.join(tmpdir(), "attachment-content-"));
});
afterAll(async () => {
  await rm(directory, { recursive: true, force: true });
});

describe("telling a file by its content", () => {
  it("knows JPEG, PNG, WebP and PDF, and names what else a file is", async () => {
    const jpeg = await demoPhotoJpeg({ label: "sniff" });
    expect(await sniffBytes(jpeg)).toEqual({ type: "image/jpeg" });
    expect(await sniffBytes(await sharp(jpeg).png().toBuffer())).toEqual({ type: "image/png" });
    expect(await sniffBytes(await sharp(jpeg).webp().toBuffer())).toEqual({ type: "image/webp" });
    expect(await sniffBytes(demoDocumentPdf("sniff", []))).toEqual({ type: "application/pdf" });
    const program = Buffer.concat([Buffer.from("MZ"), Buffer.alloc(2000)]);
    expect(await sniffBytes(program)).toEqual({ type: null, detected: "EXE (application/x-msdownload)" });
    expect(await sniffBytes(new TextEncoder().encode("just some text"))).toEqual({ type: null, detected: null });
  });
});

describe("the stored copy of a photo", () => {
  it("has no position or camera left, is upright, and its position can be read first", async () => {
    const original = path.join(directory, "original.jpg");
    const stored = path.join(directory, "stored.jpg");
    await writeFile(
      original,
      await demoPhotoJpeg({ label: "strip", exif: { latitude: -33.5, longitude: 151.25, camera: "Strip Cam" } }),
    );
    expect(await sniffFile(original)).toEqual({ type: "image/jpeg" });
    expect(await readPhotoPosition(original)).toEqual({ latitude: -33.5, longitude: 151.25 });

    expect(await writeCleanImage(original, "image/jpeg", stored)).toEqual({
      contentType: "image/jpeg",
      extension: "jpg",
    });
    const bytes = await readFile(stored);
    expect(await exifr.gps(bytes)).toBeUndefined();
    expect((await exifr.parse(bytes, { tiff: true }))?.Model).toBeUndefined();
    expect(await readPhotoPosition(stored)).toBeNull();

    const thumbnail = await sharp(await thumbnailOf(stored)).metadata();
    expect(thumbnail.format).toBe("webp");
    expect(Math.max(thumbnail.width, thumbnail.height)).toBeLessThanOrEqual(320);
  });

  it("refuses bytes that only start like an image", async () => {
    const broken = path.join(directory, "broken.jpg");
    await writeFile(broken, Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.alloc(100)]));
    await expect(writeCleanImage(broken, "image/jpeg", path.join(directory, "out.jpg"))).rejects.toThrow(
      /cannot be read/,
    );
  });
});
