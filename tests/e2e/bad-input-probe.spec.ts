import { probeInputs } from "../../scripts/probe-inputs";
import { expect, test } from "../support/e2e";

// The bad-input probe in a small form: `tsx scripts/probe-inputs.ts --count 500` is the full run.
test("generated malformed inputs to every form and the totals API get 4xx answers and leave no rows", async ({
  baseURL,
}) => {
  test.setTimeout(120_000);
  const summaries = await probeInputs({
    base: baseURL!,
    count: 12,
    seed: 11,
    database: process.env.TEST_DB_NAME || "foamtally_test",
  });
  expect(summaries.map((summary) => summary.sent)).toEqual(summaries.map(() => 12));
  expect(summaries.flatMap((summary) => summary.serverErrors)).toEqual([]);
  expect(summaries.flatMap((summary) => summary.partialRows)).toEqual([]);
});
