import { describe, expect, it } from "vitest";
import { ignoredFiltersNote, queryReader } from "./query-params";

const read = (query: string) => queryReader(new URLSearchParams(query));

describe("reading a query string's filters", () => {
  it("reads record ids as addresses write them, and notes anything else", () => {
    const query = read("station=12&location=abc&product=-1&event=0x10&lot=1e3&tank=4294967296&cache=%201");
    expect(query.recordId("station", "a station")).toBe(12);
    for (const name of ["location", "product", "event", "lot", "tank", "cache"]) {
      expect(query.recordId(name, "a record")).toBeUndefined();
    }
    expect(Object.keys(query.problems).sort()).toEqual(["cache", "event", "location", "lot", "product", "tank"]);
    expect(query.problems.location).toBe("Use a record from the list (a record id, a whole number).");
  });

  it("treats a missing or empty filter as not set, with no problem", () => {
    const query = read("station=&from=");
    expect(query.recordId("station", "a station")).toBeUndefined();
    expect(query.recordId("location", "a location")).toBeUndefined();
    expect(query.day("from")).toBeUndefined();
    expect(query.problems).toEqual({});
  });

  it("reads only days the calendar has, within the years records may fall in", () => {
    const query = read("a=2026-03-31&b=2026-02-31&c=0000-01-01&d=9999-12-31&e=2026-3-1&f=tomorrow&g=2028-02-29");
    expect(query.day("a")).toBe("2026-03-31");
    expect(query.day("g")).toBe("2028-02-29");
    for (const name of ["b", "c", "d", "e", "f"]) expect(query.day(name)).toBeUndefined();
    expect(Object.keys(query.problems).sort()).toEqual(["b", "c", "d", "e", "f"]);
  });

  it("reads whole numbers written in digits within their range", () => {
    const query = read("page=3&size=501&a=1.5&b=1e3&c=0x10&d=0&e=-2");
    expect(query.wholeNumber("page", { max: 10 })).toBe(3);
    expect(query.wholeNumber("size", { max: 500 })).toBeUndefined();
    for (const name of ["a", "b", "c", "d", "e"]) expect(query.wholeNumber(name, { max: 5000 })).toBeUndefined();
    expect(query.problems.size).toBe("Use a whole number from 1 to 500.");
    expect(Object.keys(query.problems).sort()).toEqual(["a", "b", "c", "d", "e", "size"]);
  });

  it("reads decimal degrees written in digits within their range", () => {
    const query = read("lat=44.9537&lon=-93.09&a=0x10&b=1e1&c=%2045&d=91&e=.5&f=-&g=Infinity");
    const degrees = (name: string) => query.decimal(name, { min: -90, max: 90 }, "A latitude, −90 to 90.");
    expect(degrees("lat")).toBe(44.9537);
    expect(query.decimal("lon", { min: -180, max: 180 }, "A longitude.")).toBe(-93.09);
    expect(degrees("e")).toBe(0.5);
    for (const name of ["a", "b", "c", "d", "f", "g"]) expect(degrees(name)).toBeUndefined();
    expect(Object.keys(query.problems).sort()).toEqual(["a", "b", "c", "d", "f", "g"]);
    expect(query.problems.a).toBe("A latitude, −90 to 90.");
  });

  it("reads a word of a list and bounded text", () => {
    const query = read(`kind=training&dir=sideways&dispatch=%2026-004512%20&long=${"x".repeat(33)}`);
    expect(query.choice("kind", ["incident", "training"] as const)).toBe("training");
    expect(query.choice("dir", ["asc", "desc"] as const)).toBeUndefined();
    expect(query.text("dispatch", 32, "A dispatch number")).toBe("26-004512");
    expect(query.text("long", 32, "A dispatch number")).toBeUndefined();
    expect(query.problems).toEqual({
      dir: "Use one of: asc, desc.",
      long: "A dispatch number has at most 32 characters.",
    });
  });

  it("names what a page left out of its filters, or nothing", () => {
    expect(ignoredFiltersNote({})).toBeNull();
    expect(ignoredFiltersNote({ location: "Use a location from the list (a record id, a whole number)." })).toBe(
      "Not filtered by location: Use a location from the list (a record id, a whole number).",
    );
  });
});
