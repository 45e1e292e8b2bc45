// The CRC-32 of two byte strings joined, from the CRC-32 of each and the second one's length,
// without reading either again: zlib's crc32_combine (zlib 1.2.12 and later, crc32.c), which
// multiplies polynomials modulo the CRC's own (reflected 0xEDB88320, as gzip's trailer uses).
const POLY = 0xedb88320;

/** a(x) · b(x) modulo the CRC polynomial, both reflected. */
function multiplyModP(a: number, b: number): number {
  let m = 0x80000000;
  let product = 0;
  for (;;) {
    if (a & m) {
      product ^= b;
      if ((a & (m - 1)) === 0) break;
    }
    m >>>= 1;
    b = b & 1 ? (b >>> 1) ^ POLY : b >>> 1;
  }
  return product >>> 0;
}

// X2N[k] = x^(2^k) modulo the polynomial; X2N[0] is x itself.
const X2N: number[] = [0x40000000];
for (let k = 1; k < 32; k++) X2N.push(multiplyModP(X2N[k - 1], X2N[k - 1]));

/** x^(n · 2^k) modulo the polynomial. */
function xToTheNModP(n: number, k: number): number {
  let power = 0x80000000; // x^0
  while (n > 0) {
    if (n % 2 === 1) power = multiplyModP(X2N[k & 31], power);
    n = Math.floor(n / 2);
    k += 1;
  }
  return power;
}

/** The CRC-32 of A followed by B, from CRC-32(A), CRC-32(B) and B's length in bytes. */
export function crc32Combine(crcA: number, crcB: number, lengthB: number): number {
  return (multiplyModP(xToTheNModP(lengthB, 3), crcA >>> 0) ^ crcB) >>> 0;
}
