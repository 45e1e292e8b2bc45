import { describe, expect, it } from "vitest";
import { MAX_RECORD_ID, recordIdOf } from "./record-id";

describe("recordIdOf", () => {
  it("takes plain positive whole numbers within INT UNSIGNED", () => {
    expect(recordIdOf("1")).toBe(1);
    expect(recordIdOf("42")).toBe(42);
    expect(recordIdOf(String(MAX_RECORD_ID))).toBe(MAX_RECORD_ID);
  });

  it.each(["", "abc", "0", "-1", "+5", "1e3", "0x10", "1.5", " 7", "07", String(MAX_RECORD_ID + 1), "99999999999"])(
    "refuses %j",
    (value) => {
      expect(recordIdOf(value)).toBeNull();
    },
  );

  it("refuses what is not a string", () => {
    expect(recordIdOf(undefined)).toBeNull();
    expect(recordIdOf(5)).toBeNull();
  });
});
