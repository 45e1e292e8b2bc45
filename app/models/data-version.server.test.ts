import { describe, expect, it } from "vitest";
import { parseDataVersions } from "./data-version.server";

describe("parseDataVersions", () => {
  it("reads each kind's stamp from the session query's list", () => {
    expect(
      parseDataVersions("catalogue:0b6f1c2e-9a5d-11ef-8c3e-0242ac120002,reports:1c7e2d3f-9a5d-11ef-8c3e-0242ac120002"),
    ).toEqual({
      catalogue: "0b6f1c2e-9a5d-11ef-8c3e-0242ac120002",
      reports: "1c7e2d3f-9a5d-11ef-8c3e-0242ac120002",
    });
  });

  it("gives null for a kind without a row, so nothing is kept for it", () => {
    expect(parseDataVersions("")).toEqual({ reports: null, catalogue: null });
    expect(parseDataVersions("reports:abc")).toEqual({ reports: "abc", catalogue: null });
  });
});
