import { describe, expect, it } from "vitest";
import { demoSheetPdf } from "../../seeds/06_safety_sheets";

describe("the demo's placeholder safety sheets", () => {
  it("are well-formed PDFs whose cross-reference table points at each object", () => {
    const text = new TextDecoder().decode(
      demoSheetPdf(["DEMO DATA - placeholder (not a safety data sheet)", "a (b) \\ c"]),
    );
    expect(text.startsWith("%PDF-1.4\n")).toBe(true);
    expect(text.trimEnd().endsWith("%%EOF")).toBe(true);
    const startxref = Number(/startxref\n(\d+)\n/.exec(text)?.[1]);
    expect(text.slice(startxref, startxref + 4)).toBe("xref");
    const offsets = [...text.slice(startxref).matchAll(/^(\d{10}) 00000 n $/gm)].map((match) => Number(match[1]));
    expect(offsets).toHaveLength(5);
    offsets.forEach((offset, index) => expect(text.slice(offset).startsWith(`${index + 1} 0 obj`)).toBe(true));
    expect(text).toContain("(a \\(b\\) \\\\ c) '");
    const length = Number(/\/Length (\d+)/.exec(text)?.[1]);
    const stream = text.slice(text.indexOf("stream\n") + 7, text.indexOf("\nendstream"));
    expect(stream.length).toBe(length);
  });
});
