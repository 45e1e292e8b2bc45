import { describe, expect, it } from "vitest";
import {
  EVENT_NUMBER_PREFIX_PATTERN,
  eventNumberSeries,
  formatEventNumber,
  isReservedPrefix,
  sequenceOf,
} from "./event-number";

describe("event numbers", () => {
  it("incidents carry the agency's prefix; other kinds their own series", () => {
    expect(eventNumberSeries("incident", "NV")).toBe("NV");
    expect(eventNumberSeries("incident", "")).toBe("AB");
    expect(eventNumberSeries("training", "NV")).toBe("TR");
    expect(eventNumberSeries("test", "NV")).toBe("PT");
    expect(eventNumberSeries("flush", "NV")).toBe("FL");
  });

  it("formats and reads back a sequence", () => {
    expect(formatEventNumber("AB", 2026, 42)).toBe("AB-2026-0042");
    expect(formatEventNumber("AB", 2026, 12345)).toBe("AB-2026-12345");
    expect(sequenceOf("AB-2026-0042", "AB", 2026)).toBe(42);
    expect(sequenceOf("AB-2025-0042", "AB", 2026)).toBeNull();
    expect(sequenceOf("AB-2026-12a", "AB", 2026)).toBeNull();
  });

  it("prefixes are short capitals and never a fixed series", () => {
    expect(EVENT_NUMBER_PREFIX_PATTERN.test("AB")).toBe(true);
    expect(EVENT_NUMBER_PREFIX_PATTERN.test("FD12")).toBe(true);
    expect(EVENT_NUMBER_PREFIX_PATTERN.test("ab")).toBe(false);
    expect(EVENT_NUMBER_PREFIX_PATTERN.test("1A")).toBe(false);
    expect(EVENT_NUMBER_PREFIX_PATTERN.test("ABCDEFG")).toBe(false);
    expect(isReservedPrefix("TR")).toBe(true);
    expect(isReservedPrefix("AB")).toBe(false);
  });
});
