// Rewrites the role table in README.md from the access table (app/lib/access.ts).
// `npm run access:table`; app/lib/access.test.ts fails when README.md and the table differ.
import { readFileSync, writeFileSync } from "node:fs";
import { withAccessTable } from "../app/lib/access";

const path = new URL("../README.md", import.meta.url);
const before = readFileSync(path, "utf8");
const after = withAccessTable(before);
if (after === before) {
  console.log("README.md's role table is up to date.");
} else {
  writeFileSync(path, after);
  console.log("Rewrote README.md's role table from app/lib/access.ts.");
}
