import { describe, expect, it } from "vitest";
import { retryingDeadlocks } from "./deadlock-retry";

const deadlock = () => Object.assign(new Error("Deadlock found when trying to get lock"), { errno: 1213 });

describe("retryingDeadlocks", () => {
  it("runs a deadlock's victim again until it goes through", async () => {
    let runs = 0;
    const answer = await retryingDeadlocks(async () => {
      runs += 1;
      if (runs < 3) throw deadlock();
      return "claimed";
    });
    expect(answer).toBe("claimed");
    expect(runs).toBe(3);
  });

  it("gives up after its attempts, with the database's error", async () => {
    let runs = 0;
    await expect(
      retryingDeadlocks(async () => {
        runs += 1;
        throw deadlock();
      }, 2),
    ).rejects.toThrow(/Deadlock found/);
    expect(runs).toBe(2);
  });

  it("never retries any other error", async () => {
    let runs = 0;
    await expect(
      retryingDeadlocks(async () => {
        runs += 1;
        throw Object.assign(new Error("Duplicate entry"), { errno: 1062 });
      }),
    ).rejects.toThrow(/Duplicate entry/);
    expect(runs).toBe(1);
  });
});
