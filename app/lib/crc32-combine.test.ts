import { crc32 } from "node:zlib";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { crc32Combine } from "./crc32-combine";

// Node's zlib.crc32 (zlib's own) is the reference: combining must give what reading the joined bytes gives.
describe("crc32Combine", () => {
  it("gives the CRC-32 of two byte strings joined", () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 5000 }), fc.uint8Array({ maxLength: 5000 }), (a, b) => {
        const joined = Buffer.concat([a, b]);
        expect(crc32Combine(crc32(a), crc32(b), b.length)).toBe(crc32(joined));
      }),
      { numRuns: 300 },
    );
  });

  it("gives the CRC's published check value when built from two halves", () => {
    // 0xCBF43926 is the check value of CRC-32 (the gzip and PNG CRC) for "123456789", as the
    // Catalogue of parametrised CRC algorithms lists it as CRC-32/ISO-HDLC (from memory).
    expect(crc32("123456789")).toBe(0xcbf43926);
    expect(crc32Combine(crc32("1234"), crc32("56789"), 5)).toBe(0xcbf43926);
  });

  it("handles a second part longer than 2^31 bytes by its length alone", () => {
    // A string of zeros changes the CRC as x^(8n) does; the long length must not overflow to a wrong power.
    const zeros = Buffer.alloc(1 << 20);
    let crcOfZeros = crc32(zeros);
    let length = zeros.length;
    for (let doubling = 0; doubling < 12; doubling++) {
      crcOfZeros = crc32Combine(crcOfZeros, crcOfZeros, length);
      length *= 2;
    }
    expect(length).toBeGreaterThan(2 ** 31);
    const withPrefix = crc32Combine(crc32("abc"), crcOfZeros, length);
    // Same bytes built the other way round: "abc" then 2^32 zeros as one megabyte repeated.
    let direct = crc32("abc");
    for (let megabyte = 0; megabyte < length / zeros.length; megabyte++) direct = crc32(zeros, direct);
    expect(withPrefix).toBe(direct);
  });
});
