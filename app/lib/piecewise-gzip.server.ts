import { promisify } from "node:util";
import { constants, crc32, deflateRaw } from "node:zlib";
import { crc32Combine } from "./crc32-combine";

const deflateRawAsync = promisify(deflateRaw);

// RFC 1952 member header: deflate, no flags, no time, no extra flags, operating system unknown.
const GZIP_HEADER = Buffer.from([0x1f, 0x8b, 0x08, 0x00, 0, 0, 0, 0, 0x00, 0xff]);
// An empty final block with fixed codes (RFC 1951 §3.2.6): what zlib writes on finishing after a flush.
const FINAL_EMPTY_BLOCK = Buffer.from([0x03, 0x00]);
// Deflate looks back at most 32 KiB (RFC 1951 §2).
const WINDOW_BYTES = 32 * 1024;
// The last WINDOW_BYTES + 1 UTF-16 units of a text hold its last WINDOW_BYTES bytes of UTF-8: every
// unit but the first is a whole character of at least one byte, whatever the first was cut from.
const TAIL_UNITS = WINDOW_BYTES + 1;

type KeptPiece = { deflated: Buffer; crc: number; bytes: number };

/** The preset dictionary for a piece that follows `text`: its last 32 KiB, in a buffer of its own. */
function dictionaryAfter(text: string): Buffer {
  return Buffer.from(Buffer.from(text.slice(-TAIL_UNITS), "utf8").subarray(-WINDOW_BYTES));
}

/**
 * Gzip bodies built from pieces of text, each piece compressed on its own and kept by its text and
 * the bytes just before it, so a body that differs from an earlier one in a few pieces compresses
 * only those and the pieces just after them. Each piece is raw deflate ended by a sync flush
 * (byte-aligned, not final), primed with the last 32 KiB of the piece before it as a preset
 * dictionary: in the joined stream those are exactly the bytes the inflater has just written, so
 * the piece may refer back into them, and the pieces follow one another in one deflate stream (the
 * way parallel gzip tools join their blocks) at nearly the size of compressing the whole at once.
 * A kept piece keeps its CRC-32 and length too, so a body of kept pieces is joined without encoding
 * or checksumming their text again. The body is one ordinary gzip member that any client inflates
 * to the pieces joined. What is kept is bounded by the kept texts, dictionaries and compressed bytes
 * together, oldest out first.
 */
export class PiecewiseGzip {
  // By text: the dictionary a piece after it starts from, and its compressed forms by the dictionary
  // before it (a text is nearly always kept after one only).
  private readonly kept = new Map<
    string,
    { after: Buffer; entries: { dictionary: Buffer | null; piece: KeptPiece }[] }
  >();
  private keptBytes = 0;
  /** Pieces compressed (not found kept) since this instance was made. */
  compressedPieces = 0;

  constructor(
    private readonly budgetBytes: number,
    private readonly level = 6,
  ) {}

  async gzip(pieces: readonly string[]): Promise<Buffer> {
    // Empty pieces add nothing, and are left out: Node's zlib can leave a zero-length buffer it
    // compressed unreadable to crc32.
    const texts = pieces.filter((piece) => piece !== "");
    const parts = await Promise.all(
      texts.map((text, index) => {
        if (index === 0) return this.piece(text, null);
        const before = texts[index - 1];
        return this.piece(text, this.kept.get(before)?.after ?? dictionaryAfter(before));
      }),
    );
    let crc = 0;
    let length = 0;
    for (const part of parts) {
      crc = crc32Combine(crc, part.crc, part.bytes);
      length += part.bytes;
    }
    const trailer = Buffer.alloc(8);
    trailer.writeUInt32LE(crc >>> 0, 0);
    trailer.writeUInt32LE(length % 2 ** 32, 4);
    return Buffer.concat([GZIP_HEADER, ...parts.map((part) => part.deflated), FINAL_EMPTY_BLOCK, trailer]);
  }

  private async piece(text: string, dictionary: Buffer | null): Promise<KeptPiece> {
    const sameDictionary = (entry: { dictionary: Buffer | null }) =>
      entry.dictionary === null || dictionary === null
        ? entry.dictionary === dictionary
        : entry.dictionary === dictionary || entry.dictionary.equals(dictionary);
    const kept = this.kept.get(text);
    const found = kept?.entries.find(sameDictionary);
    if (kept && found) {
      this.kept.delete(text);
      this.kept.set(text, kept);
      return found.piece;
    }
    const bytes = Buffer.from(text, "utf8");
    const deflated = await deflateRawAsync(bytes, {
      level: this.level,
      finishFlush: constants.Z_SYNC_FLUSH,
      ...(dictionary === null ? {} : { dictionary }),
    });
    const piece = { deflated, crc: crc32(bytes), bytes: bytes.length };
    this.compressedPieces += 1;
    const current = this.kept.get(text);
    if (!current?.entries.some(sameDictionary)) {
      const entry = { dictionary, piece };
      if (current) {
        current.entries.push(entry);
      } else {
        const after = Buffer.from(bytes.subarray(-WINDOW_BYTES));
        this.kept.set(text, { after, entries: [entry] });
        this.keptBytes += text.length + after.length;
      }
      this.keptBytes += (dictionary?.length ?? 0) + deflated.length;
    }
    for (const [oldest, dropped] of this.kept) {
      if (this.keptBytes <= this.budgetBytes) break;
      this.kept.delete(oldest);
      this.keptBytes -= oldest.length + dropped.after.length;
      for (const entry of dropped.entries)
        this.keptBytes -= (entry.dictionary?.length ?? 0) + entry.piece.deflated.length;
    }
    return piece;
  }
}
