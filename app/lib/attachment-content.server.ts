import { createHash } from "node:crypto";
import { createReadStream } from "node:fs";
import { rm, stat } from "node:fs/promises";
import { pipeline } from "node:stream/promises";
import exifr from "exifr";
import { fileTypeFromBuffer, fileTypeFromFile, type FileTypeResult } from "file-type";
import sharp from "sharp";
import { ATTACHMENT_TYPES, isAttachmentType, refusedTypeMessage, type AttachmentType } from "./attachment-files";

/**
 * What an uploaded file is (by its bytes, with `file-type`), the copy of a photo that is stored
 * (re-encoded by `sharp`, which writes no EXIF, GPS, camera or XMP data unless asked), its thumbnail,
 * and, only when the officer asks for it, the position the photo recorded (read with `exifr` first).
 */

export type SniffedType = { type: AttachmentType } | { type: null; detected: string | null };

/** What a file on disk is, by its first bytes. */
export async function sniffFile(filePath: string): Promise<SniffedType> {
  return sniffed(await fileTypeFromFile(filePath));
}

/** What bytes in memory are (a safety sheet, read by the bounded form reader). */
export async function sniffBytes(bytes: Uint8Array): Promise<SniffedType> {
  return sniffed(await fileTypeFromBuffer(bytes));
}

function sniffed(found: FileTypeResult | undefined): SniffedType {
  // file-type names HEIC stills image/heic and HEIC sequences image/heic-sequence.
  const mime = found?.mime === "image/heif" ? "image/heic" : found?.mime;
  if (isAttachmentType(mime)) return { type: mime };
  return { type: null, detected: found ? `${found.ext.toUpperCase()} (${found.mime})` : null };
}

/** Thumbnails fit in 320 × 320 px, as WebP (common practice, no source). */
const THUMBNAIL_EDGE_PX = 320;
/** Pixels a photo may have before it is refused: 100 megapixels (a guard against decompression bombs). */
const MAX_INPUT_PIXELS = 100_000_000;

export class UnreadableImageError extends Error {}

export type PhotoPosition = { latitude: number; longitude: number };

/** The GPS position a photo recorded, or null. */
export async function readPhotoPosition(filePath: string): Promise<PhotoPosition | null> {
  try {
    const gps = await exifr.gps(filePath);
    if (!gps || !Number.isFinite(gps.latitude) || !Number.isFinite(gps.longitude)) return null;
    if (Math.abs(gps.latitude) > 90 || Math.abs(gps.longitude) > 180) return null;
    return { latitude: Number(gps.latitude.toFixed(6)), longitude: Number(gps.longitude.toFixed(6)) };
  } catch {
    return null;
  }
}

export type CleanedImage = { contentType: AttachmentType; extension: string };

/**
 * Writes the stored copy of a photo to `outputPath`: turned upright by its orientation tag, then
 * written without any metadata. HEIC, which this build of sharp may not write, is stored as JPEG.
 */
export async function writeCleanImage(
  inputPath: string,
  type: AttachmentType,
  outputPath: string,
): Promise<CleanedImage> {
  try {
    const image = sharp(inputPath, { limitInputPixels: MAX_INPUT_PIXELS, failOn: "error" }).rotate();
    if (type === "image/png") await image.png().toFile(outputPath);
    else if (type === "image/webp") await image.webp({ quality: 90 }).toFile(outputPath);
    else await image.jpeg({ quality: 90, mozjpeg: true }).toFile(outputPath);
  } catch (error) {
    throw new UnreadableImageError(
      type === "image/heic"
        ? "This HEIC photo cannot be read here. Save it as JPEG on the phone or camera and attach it again."
        : "This image cannot be read; it may be damaged. Attach it again or save it anew.",
      { cause: error },
    );
  }
  const stored: AttachmentType = type === "image/heic" ? "image/jpeg" : type;
  return { contentType: stored, extension: ATTACHMENT_TYPES[stored].extension };
}

/** A small WebP of the stored image for lists. */
export async function thumbnailOf(imagePath: string): Promise<Uint8Array> {
  const buffer = await sharp(imagePath, { limitInputPixels: MAX_INPUT_PIXELS })
    .resize(THUMBNAIL_EDGE_PX, THUMBNAIL_EDGE_PX, { fit: "inside", withoutEnlargement: true })
    .webp({ quality: 70 })
    .toBuffer();
  return new Uint8Array(buffer);
}

/** A file refused by its content, with the reason a person can act on. */
export class RefusedFileError extends Error {}

export type PreparedFile = {
  /** The file to store: the received one, or the cleaned copy of a photo. */
  path: string;
  contentType: AttachmentType;
  extension: string;
  byteSize: number;
  sha256: string;
  image: boolean;
  thumbnail: Uint8Array | null;
  position: PhotoPosition | null;
  /** Removes the cleaned copy (the received file is the caller's). */
  discard: () => Promise<void>;
};

async function sha256OfFile(filePath: string): Promise<string> {
  const hash = createHash("sha256");
  await pipeline(createReadStream(filePath), hash);
  return hash.digest("hex");
}

/**
 * Makes a received file ready to store: its type told by content (else `RefusedFileError`), a photo
 * re-encoded without metadata with its thumbnail, and, when `usePosition`, the photo's position read
 * before the metadata goes. Answers the size and SHA-256 of what will be stored.
 */
export async function prepareFile(receivedPath: string, options: { usePosition: boolean }): Promise<PreparedFile> {
  const sniffedType = await sniffFile(receivedPath);
  if (!sniffedType.type) throw new RefusedFileError(refusedTypeMessage(sniffedType.detected));
  const cleanedPath = `${receivedPath}-stored`;
  const discard = () => rm(cleanedPath, { force: true });
  try {
    let path = receivedPath;
    let contentType: AttachmentType = sniffedType.type;
    let thumbnail: Uint8Array | null = null;
    let position: PhotoPosition | null = null;
    const image = ATTACHMENT_TYPES[sniffedType.type].image;
    if (image) {
      if (options.usePosition) position = await readPhotoPosition(receivedPath);
      try {
        contentType = (await writeCleanImage(receivedPath, sniffedType.type, cleanedPath)).contentType;
      } catch (error) {
        if (error instanceof UnreadableImageError) throw new RefusedFileError(error.message);
        throw error;
      }
      path = cleanedPath;
      thumbnail = await thumbnailOf(cleanedPath);
    }
    return {
      path,
      contentType,
      extension: ATTACHMENT_TYPES[contentType].extension,
      byteSize: (await stat(path)).size,
      sha256: await sha256OfFile(path),
      image,
      thumbnail,
      position,
      discard,
    };
  } catch (error) {
    await discard();
    throw error;
  }
}
