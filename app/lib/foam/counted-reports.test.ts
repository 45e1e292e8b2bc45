import { describe, expect, it } from "vitest";
import { COUNTED_REPORTS, countedReportsOfList, VOLUME_LABELS } from "./vocabulary";

describe("the words beside every total", () => {
  it("names the set each total counts, in the same words on the list, the map and the quarter", () => {
    expect(countedReportsOfList(undefined)).toBe("filed, returned and accepted, including your drafts");
    expect(countedReportsOfList(undefined)).toContain(COUNTED_REPORTS.submitted);
    expect(countedReportsOfList("accepted")).toBe(COUNTED_REPORTS.accepted);
    expect(countedReportsOfList("filed")).toBe("filed only");
    expect(countedReportsOfList("draft")).toBe("your drafts only");
  });

  it("labels the three big figures as computed, not as a proportioner's readout", () => {
    expect(Object.values(VOLUME_LABELS)).toEqual(["Computed water", "Computed concentrate", "Computed solution"]);
  });
});
