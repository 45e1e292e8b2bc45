import { HAND_MADE, probeInputs } from "../../scripts/probe-inputs";
import { expect, test } from "../support/e2e";

// The bad-input probe in a small form: `tsx scripts/probe-inputs.ts --count 500` is the full run.
test("generated malformed inputs to every form and JSON endpoint, and the hand-made hostile ones, get 4xx answers and leave no rows", async ({
  baseURL,
}) => {
  test.setTimeout(240_000);
  const summaries = await probeInputs({
    base: baseURL!,
    count: 12,
    seed: 11,
    database: process.env.TEST_DB_NAME || "foamtally_test",
  });
  const generated = summaries.filter((summary) => summary.endpoint !== HAND_MADE);
  expect(generated.length).toBeGreaterThanOrEqual(41);
  expect(generated.map((summary) => summary.sent)).toEqual(generated.map(() => 12));
  expect(summaries.find((summary) => summary.endpoint === HAND_MADE)?.sent).toBeGreaterThan(150);
  expect(summaries.flatMap((summary) => summary.serverErrors)).toEqual([]);
  expect(summaries.flatMap((summary) => summary.partialRows)).toEqual([]);
});
