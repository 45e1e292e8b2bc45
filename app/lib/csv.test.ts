import { describe, expect, it } from "vitest";
import { csvField, csvLine } from "./csv";

describe("csv (RFC 4180)", () => {
  it("quotes fields with commas, quotes and line breaks, doubling inner quotes", () => {
    expect(csvLine(["a", "b,c", 'say "hi"', "two\nlines"])).toBe('a,"b,c","say ""hi""","two\nlines"\r\n');
  });

  it("writes numbers, booleans and blanks plainly", () => {
    expect(csvLine([1.5, -2, true, null, undefined])).toBe("1.5,-2,true,,\r\n");
  });

  it("defuses text a spreadsheet would run as a formula", () => {
    expect(csvField("=SUM(A1)")).toBe("'=SUM(A1)");
    expect(csvField("@cmd")).toBe("'@cmd");
    expect(csvField("-1+2")).toBe("'-1+2");
    expect(csvField("-12.5")).toBe("-12.5");
  });
});
