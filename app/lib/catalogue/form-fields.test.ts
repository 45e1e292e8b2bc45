import { describe, expect, it } from "vitest";
import { z } from "zod";
import { checkbox, coordinate, optionalNumber, optionalText } from "./form-fields";

const messageOf = (schema: z.ZodType, value: unknown) => {
  const result = schema.safeParse(value);
  return result.success ? null : result.error.issues[0].message;
};

describe("catalogue form fields", () => {
  it("reads blank numbers as null and refuses what is not a number in range", () => {
    const flow = optionalNumber("The flow", { max: 2_000, positive: true });
    expect(flow.parse("")).toBeNull();
    expect(flow.parse(" 125 ")).toBe(125);
    expect(messageOf(flow, "0")).toBe("The flow must be a number above zero.");
    expect(messageOf(flow, "abc")).toBe("The flow must be a number above zero.");
    expect(messageOf(flow, "Infinity")).toBe("The flow must be a number above zero.");
    expect(messageOf(flow, "2001")).toBe("The flow is at most 2,000.");
    expect(messageOf(optionalNumber("The cost", { max: Infinity }), "-1")).toBe(
      "The cost must be a number of zero or more.",
    );
    expect(optionalNumber("The cost", { max: Infinity }).parse("1e9")).toBe(1e9);
  });

  it("keeps coordinates within their limit", () => {
    const latitude = coordinate("Latitude", 90);
    expect(latitude.parse("-45.5")).toBe(-45.5);
    expect(latitude.parse(undefined)).toBeNull();
    expect(messageOf(latitude, "91")).toBe("Latitude is a number from -90 to 90.");
    expect(messageOf(latitude, "north")).toBe("Latitude is a number from -90 to 90.");
  });

  it("reads text and checkboxes", () => {
    expect(optionalText(5, "The maker").parse("  ")).toBeNull();
    expect(messageOf(optionalText(5, "The maker"), "abcdef")).toBe("The maker has at most 5 characters.");
    expect(checkbox.parse("on")).toBe(true);
    expect(checkbox.parse(undefined)).toBe(false);
  });
});
