import { createHash } from "node:crypto";
import { promisify } from "node:util";
import { constants, crc32, deflateRaw } from "node:zlib";

const deflateRawAsync = promisify(deflateRaw);

// RFC 1952 member header: deflate, no flags, no time, no extra flags, operating system unknown.
const GZIP_HEADER = Buffer.from([0x1f, 0x8b, 0x08, 0x00, 0, 0, 0, 0, 0x00, 0xff]);
// An empty final block with fixed codes (RFC 1951 §3.2.6): what zlib writes on finishing after a flush.
const FINAL_EMPTY_BLOCK = Buffer.from([0x03, 0x00]);
// Deflate looks back at most 32 KiB (RFC 1951 §2).
const WINDOW_BYTES = 32 * 1024;

/**
 * Gzip bodies built from pieces of text, each piece compressed on its own and kept by its digest
 * and the digest of the piece before it, so a body that differs from an earlier one in a few pieces
 * compresses only those and the pieces just after them. Each piece is raw deflate ended by a sync
 * flush (byte-aligned, not final), primed with the last 32 KiB of the piece before it as a preset
 * dictionary: in the joined stream those are exactly the bytes the inflater has just written, so
 * the piece may refer back into them, and the pieces follow one another in one deflate stream (the
 * way parallel gzip tools join their blocks) at nearly the size of compressing the whole at once.
 * The body is one ordinary gzip member that any client inflates to the pieces joined. What is kept
 * is bounded by the compressed bytes, oldest out first.
 */
export class PiecewiseGzip {
  private readonly kept = new Map<string, Buffer>();
  private keptBytes = 0;
  /** Pieces compressed (not found kept) since this instance was made. */
  compressedPieces = 0;

  constructor(
    private readonly budgetBytes: number,
    private readonly level = 6,
  ) {}

  async gzip(pieces: readonly string[]): Promise<Buffer> {
    // Empty pieces add nothing, and are left out: Node's zlib can leave a zero-length buffer it
    // compressed unreadable to crc32. The check value is taken before any compression for that reason.
    const texts = pieces.filter((piece) => piece !== "").map((piece) => Buffer.from(piece, "utf8"));
    let crc = 0;
    let length = 0;
    for (const text of texts) {
      crc = crc32(text, crc);
      length += text.length;
    }
    const digests = texts.map((text) => createHash("sha256").update(text).digest("base64"));
    const deflated = await Promise.all(
      texts.map((text, index) =>
        this.deflated(text, index === 0 ? null : texts[index - 1], `${digests[index - 1] ?? ""} ${digests[index]}`),
      ),
    );
    const trailer = Buffer.alloc(8);
    trailer.writeUInt32LE(crc >>> 0, 0);
    trailer.writeUInt32LE(length % 2 ** 32, 4);
    return Buffer.concat([GZIP_HEADER, ...deflated, FINAL_EMPTY_BLOCK, trailer]);
  }

  private async deflated(text: Buffer, before: Buffer | null, key: string): Promise<Buffer> {
    const kept = this.kept.get(key);
    if (kept) {
      this.kept.delete(key);
      this.kept.set(key, kept);
      return kept;
    }
    const piece = await deflateRawAsync(text, {
      level: this.level,
      finishFlush: constants.Z_SYNC_FLUSH,
      ...(before ? { dictionary: before.subarray(-WINDOW_BYTES) } : {}),
    });
    this.compressedPieces += 1;
    if (!this.kept.has(key)) {
      this.kept.set(key, piece);
      this.keptBytes += piece.length;
    }
    for (const [oldest, buffer] of this.kept) {
      if (this.keptBytes <= this.budgetBytes) break;
      this.kept.delete(oldest);
      this.keptBytes -= buffer.length;
    }
    return piece;
  }
}
