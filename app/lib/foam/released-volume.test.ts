import { describe, expect, it } from "vitest";
import {
  containedGallons,
  reachedEnvironment,
  releasedGallons,
  shareNotContained,
  unaccountedGallons,
} from "./released-volume";

describe("released volume of a runoff line", () => {
  it("is the stated volume when one was given", () => {
    expect(releasedGallons({ volumeGal: 120, sharePercent: null }, 500)).toBe(120);
  });

  it("is the stated share of the event's foam solution otherwise", () => {
    expect(releasedGallons({ volumeGal: null, sharePercent: 60 }, 500)).toBe(300);
  });

  it("is nothing for a line with neither", () => {
    expect(releasedGallons({ volumeGal: null, sharePercent: null }, 500)).toBe(0);
  });
});

describe("share not contained", () => {
  it("is what the contained lines leave of the solution", () => {
    const lines = [
      { disposition: "contained" as const, sharePercent: 30, volumeGal: null },
      { disposition: "storm_drain" as const, sharePercent: 70, volumeGal: null },
    ];
    const contained = containedGallons(lines, 1000);
    expect(contained).toBe(300);
    expect(shareNotContained(contained, 1000)).toBeCloseTo(0.7, 12);
  });

  it("counts everything as released when nothing was contained or no runoff was recorded", () => {
    expect(shareNotContained(0, 400)).toBe(1);
    expect(shareNotContained(0, 0)).toBe(1);
  });

  it("stays between none and all when the stated volumes exceed the solution", () => {
    expect(shareNotContained(600, 400)).toBe(0);
  });
});

describe("reachedEnvironment (issue 10 §4: releases apart from contained, sewer with notice and evaporated)", () => {
  it("counts soil, storm drain, surface water and an unknown fate as released", () => {
    for (const disposition of ["soil", "storm_drain", "surface_water", "evaporated_unknown"] as const) {
      expect(reachedEnvironment(disposition, null)).toBe(true);
    }
  });

  it("holds back contained runoff and sewer runoff with a notice, but not sewer runoff without one", () => {
    expect(reachedEnvironment("contained", null)).toBe(false);
    expect(reachedEnvironment("sanitary_sewer", "Notice 12 to the treatment works")).toBe(false);
    expect(reachedEnvironment("sanitary_sewer", "  ")).toBe(true);
    expect(reachedEnvironment("sanitary_sewer", null)).toBe(true);
  });
});

describe("unaccountedGallons (issue 10 §4: runoff that does not add up)", () => {
  it("leaves the solution the lines do not account for", () => {
    const lines = [
      { disposition: "contained" as const, sharePercent: null, volumeGal: 300 },
      { disposition: "soil" as const, sharePercent: 20, volumeGal: null },
    ];
    // 1,000 gal of solution: 300 contained + 200 to soil leaves 500 unaccounted.
    expect(unaccountedGallons(lines, 1000)).toBeCloseTo(500, 9);
  });

  it("is zero when the lines add up, within rounding, or exceed the solution", () => {
    const third = { disposition: "soil" as const, sharePercent: 33.333, volumeGal: null };
    expect(unaccountedGallons([third, third, { ...third, sharePercent: 33.334 }], 12)).toBe(0);
    expect(unaccountedGallons([{ disposition: "contained", sharePercent: null, volumeGal: 20 }], 10)).toBe(0);
  });

  it("is the whole solution when no runoff was recorded, and nothing when none was made", () => {
    expect(unaccountedGallons([], 40)).toBe(40);
    expect(unaccountedGallons([], 0)).toBe(0);
  });
});
