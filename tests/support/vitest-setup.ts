import { afterEach, beforeEach, vi, type MockInstance } from "vitest";

// A test that logs an unexpected console.error fails: errors are either asserted or fixed.
let errorSpy: MockInstance<typeof console.error>;
beforeEach(() => {
  errorSpy = vi.spyOn(console, "error");
});
afterEach(() => {
  const calls = errorSpy.mock.calls;
  errorSpy.mockRestore();
  if (calls.length > 0) {
    throw new Error(`Unexpected console.error: ${calls.map((call) => call.map(String).join(" ")).join("\n")}`);
  }
});
