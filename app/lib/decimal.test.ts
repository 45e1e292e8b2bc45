import { describe, expect, it } from "vitest";
import { decimalOrNull, decimalOrZero } from "./decimal";

describe("stored decimals", () => {
  it("reads a DECIMAL string as the number it holds", () => {
    expect(decimalOrNull("12.3450")).toBe(12.345);
    expect(decimalOrNull("-0.5")).toBe(-0.5);
    expect(decimalOrNull(7)).toBe(7);
  });

  it("keeps a missing value apart from a zero", () => {
    expect(decimalOrNull(null)).toBeNull();
    expect(decimalOrNull(undefined)).toBeNull();
    expect(decimalOrNull("")).toBeNull();
    expect(decimalOrNull("0.0000")).toBe(0);
  });

  it("refuses what is not a finite number", () => {
    expect(decimalOrNull("abc")).toBeNull();
    expect(decimalOrNull(Number.POSITIVE_INFINITY)).toBeNull();
  });

  it("counts a missing value as zero where a sum needs one", () => {
    expect(decimalOrZero(null)).toBe(0);
    expect(decimalOrZero("2.5")).toBe(2.5);
  });
});
