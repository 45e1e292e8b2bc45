import { describe, expect, it } from "vitest";
import {
  clearAllUnsavedCopies,
  clearUnsavedCopy,
  fieldEntriesOf,
  readUnsavedCopy,
  sameEntries,
  UNSAVED_COPY_MAX_AGE_MS,
  unsavedCopyKey,
  writeUnsavedCopy,
} from "./unsaved-copy";

/** A Storage kept in a Map, as the browser's localStorage behaves. */
function memoryStorage(): Storage {
  const items = new Map<string, string>();
  return {
    get length() {
      return items.size;
    },
    clear: () => items.clear(),
    getItem: (key) => items.get(key) ?? null,
    key: (index) => [...items.keys()][index] ?? null,
    removeItem: (key) => void items.delete(key),
    setItem: (key, value) => void items.set(key, String(value)),
  };
}

describe("the unsaved copy of a report", () => {
  it("keeps every named field the form has, but not what the server sets per page or files", () => {
    const form = new FormData();
    form.append("submissionKey", "0f3c2a1e-aaaa");
    form.append("version", "3");
    form.append("number", "AB-2026-0042");
    form.append("discharges[0].flow", "150");
    form.append("someFieldAddedLater", "kept too");
    form.append("attachment", new Blob(["x"]), "photo.jpg");
    expect(fieldEntriesOf(form)).toEqual([
      ["number", "AB-2026-0042"],
      ["discharges[0].flow", "150"],
      ["someFieldAddedLater", "kept too"],
    ]);
  });

  it("is one key per person and report", () => {
    expect(unsavedCopyKey(7, "new")).not.toBe(unsavedCopyKey(8, "new"));
    expect(unsavedCopyKey(7, 12)).not.toBe(unsavedCopyKey(7, "new"));
  });

  it("reads back what was written, and nothing once cleared", () => {
    const storage = memoryStorage();
    const key = unsavedCopyKey(7, 12);
    const copy = {
      savedAt: "2026-12-02T14:00:00.000Z",
      baseVersion: 3,
      entries: [["number", "AB-1"]] as [string, string][],
    };
    expect(writeUnsavedCopy(storage, key, copy)).toBe(true);
    expect(readUnsavedCopy(storage, key, new Date("2026-12-02T15:00:00Z"))).toEqual(copy);
    clearUnsavedCopy(storage, key);
    expect(readUnsavedCopy(storage, key)).toBeNull();
  });

  it("offers no copy that is too old, malformed or not JSON", () => {
    const storage = memoryStorage();
    const savedAt = "2026-11-01T00:00:00.000Z";
    storage.setItem("old", JSON.stringify({ savedAt, baseVersion: null, entries: [] }));
    const later = new Date(Date.parse(savedAt) + UNSAVED_COPY_MAX_AGE_MS + 1);
    expect(readUnsavedCopy(storage, "old", later)).toBeNull();
    storage.setItem("shape", JSON.stringify({ savedAt, entries: [[1, 2]] }));
    expect(readUnsavedCopy(storage, "shape", new Date(savedAt))).toBeNull();
    storage.setItem("text", "{not json");
    expect(readUnsavedCopy(storage, "text")).toBeNull();
  });

  it("answers false, not an exception, when the browser refuses to store", () => {
    const full = {
      ...memoryStorage(),
      setItem: () => {
        throw new Error("QuotaExceededError");
      },
    } as Storage;
    expect(writeUnsavedCopy(full, "k", { savedAt: new Date().toISOString(), baseVersion: null, entries: [] })).toBe(
      false,
    );
  });

  it("sign-out removes every person's copies and leaves other keys alone", () => {
    const storage = memoryStorage();
    const copy = { savedAt: new Date().toISOString(), baseVersion: null, entries: [] };
    writeUnsavedCopy(storage, unsavedCopyKey(7, "new"), copy);
    writeUnsavedCopy(storage, unsavedCopyKey(8, 3), copy);
    storage.setItem("unrelated", "1");
    clearAllUnsavedCopies(storage);
    expect(storage.length).toBe(1);
    expect(storage.getItem("unrelated")).toBe("1");
  });

  it("compares serializations by value, in any order", () => {
    expect(
      sameEntries(
        [
          ["a", "1"],
          ["b", "2"],
        ],
        [
          ["b", "2"],
          ["a", "1"],
        ],
      ),
    ).toBe(true);
    expect(sameEntries([["a", "1"]], [["a", "2"]])).toBe(false);
    expect(
      sameEntries(
        [["a", "1"]],
        [
          ["a", "1"],
          ["a", "1"],
        ],
      ),
    ).toBe(false);
  });
});
