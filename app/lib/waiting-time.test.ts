import { describe, expect, it } from "vitest";
import { waitingText } from "./waiting-time";

describe("how long a report has waited", () => {
  it("reads in days and hours, hours and minutes, or minutes", () => {
    expect(waitingText(0)).toBe("0 min");
    expect(waitingText(12)).toBe("12 min");
    expect(waitingText(5 * 60 + 20)).toBe("5 h 20 min");
    expect(waitingText(3 * 1440 + 4 * 60 + 59)).toBe("3 d 4 h");
    expect(waitingText(-5)).toBe("0 min");
  });
});
