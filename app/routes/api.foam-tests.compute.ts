import type { Route } from "./+types/api.foam-tests.compute";
import { requireUser } from "~/lib/auth.server";
import { AccuracyTestInputSchema, computeAccuracyTest } from "~/lib/foam/accuracy-test";
import { fieldErrors } from "~/lib/foam/report-schema";
import { readJsonBody } from "~/lib/form-data.server";
import { apiError } from "~/lib/http.server";
import { readAgencySettings } from "~/models/agency-settings.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requireUser(request);
  apiError(405, "Use POST with a JSON body of readings.");
}

/** The achieved percentage of solution, the fit and pass/fail of an accuracy test, without saving it. */
export async function action({ request }: Route.ActionArgs) {
  await requireUser(request);
  const body = await readJsonBody(request, AccuracyTestInputSchema);
  const parsed = AccuracyTestInputSchema.safeParse(body);
  if (!parsed.success) {
    return Response.json({ error: "Some values cannot be used.", errors: fieldErrors(parsed.error) }, { status: 400 });
  }
  const settings = await readAgencySettings();
  return Response.json(computeAccuracyTest(parsed.data, settings.classAAccuracyShare));
}
