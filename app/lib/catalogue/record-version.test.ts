import { describe, expect, it } from "vitest";
import { formVersion, submittedVersion } from "./record-version";

function form(fields: Record<string, string>) {
  const data = new FormData();
  for (const [key, value] of Object.entries(fields)) data.append(key, value);
  return data;
}

describe("record versions on catalogue forms", () => {
  it("reads a whole positive version and refuses anything else", () => {
    expect(submittedVersion(form({ version: "3" }))).toBe(3);
    expect(submittedVersion(form({ version: " 12 " }))).toBe(12);
    expect(submittedVersion(form({}))).toBeNull();
    expect(submittedVersion(form({ version: "" }))).toBeNull();
    expect(submittedVersion(form({ version: "0" }))).toBeNull();
    expect(submittedVersion(form({ version: "2.5" }))).toBeNull();
    expect(submittedVersion(form({ version: "-1" }))).toBeNull();
  });

  it("keeps the version a refused form was sent with, not the newer stored one", () => {
    expect(formVersion({ initialValue: { version: "2" } }, 5)).toBe("2");
    expect(formVersion(null, 5)).toBe("5");
    expect(formVersion(undefined, 5)).toBe("5");
    expect(formVersion({ status: "error" }, 5)).toBe("5");
    expect(formVersion({ initialValue: { name: "x" } }, 5)).toBe("5");
  });
});
