import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";

// Decision records: docs/decisions/NNN-title.md, each dated, with context → decision → consequences,
// and each listed under "Decisions" in DEVELOPERS.md.
const folder = "docs/decisions";
const records = readdirSync(folder)
  .filter((name) => name.endsWith(".md"))
  .sort();
const developers = readFileSync("DEVELOPERS.md", "utf8");
const decisionsSection = developers.slice(developers.indexOf("\n## Decisions"));

describe("decision records", () => {
  it("exist", () => {
    expect(records.length).toBeGreaterThan(0);
  });

  it("are named NNN-title.md with numbers used once", () => {
    for (const name of records) expect(name).toMatch(/^\d{3}-[a-z0-9]+(-[a-z0-9]+)*\.md$/);
    const numbers = records.map((name) => name.slice(0, 3));
    const repeated = numbers.filter((number, index) => numbers.indexOf(number) !== index);
    expect(repeated).toEqual([]);
  });

  it.each(records)("%s has its number in the title, a date and the three headings in order", (name) => {
    const text = readFileSync(path.join(folder, name), "utf8");
    expect(text.split("\n")[0]).toMatch(new RegExp(`^# ${name.slice(0, 3)}\\b`));
    expect(text).toMatch(/^Date: \d{4}-\d{2}-\d{2}$/m);
    const headings = [...text.matchAll(/^## (.+)$/gm)].map((match) => match[1].trim());
    expect(headings).toEqual(["Context", "Decision", "Consequences"]);
  });

  it.each(records)("%s is linked from the Decisions section of DEVELOPERS.md", (name) => {
    expect(decisionsSection).toContain(`(docs/decisions/${name})`);
  });

  it("DEVELOPERS.md links no record that does not exist", () => {
    const linked = [...developers.matchAll(/\(docs\/decisions\/([^)#]+\.md)\)/g)].map((match) => match[1]);
    expect(linked.length).toBeGreaterThan(0);
    expect(linked.filter((name) => !records.includes(name))).toEqual([]);
  });
});
