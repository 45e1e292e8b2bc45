import type { Route } from "./+types/api.totals";
import { requireUser } from "~/lib/auth.server";
import { fieldErrors, TotalsRequestSchema } from "~/lib/foam/report-schema";
import { readJsonBody } from "~/lib/form-data.server";
import { apiError, jsonResponse } from "~/lib/http.server";
import { apiVolume } from "~/models/event-read.server";
import { computeWithKeptFacts } from "~/models/kept-facts.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requireUser(request);
  apiError(405, "Use POST with a JSON body of discharges.");
}

/** Computes water, concentrate and foam solution without saving anything. */
export async function action({ request }: Route.ActionArgs) {
  await requireUser(request);
  const body = await readJsonBody(request, TotalsRequestSchema);
  const parsed = TotalsRequestSchema.safeParse(body);
  if (!parsed.success) {
    return Response.json({ error: "Some values cannot be used.", errors: fieldErrors(parsed.error) }, { status: 400 });
  }
  const usage = await computeWithKeptFacts(
    request,
    parsed.data.discharges.map((line) => ({
      ...line,
      percent: line.percent ?? null,
      percentOf: line.percentOf ?? (line.basis === "water" ? "water" : "solution"),
      productId: line.productId ?? null,
      apparatusId: line.apparatusId ?? null,
    })),
  );
  const totals = (item: {
    water: { gal: number };
    concentrate: { gal: number };
    solution: { gal: number };
    effectivePercentOfSolution: number | null;
  }) => ({
    water: apiVolume(item.water.gal),
    concentrate: apiVolume(item.concentrate.gal),
    solution: apiVolume(item.solution.gal),
    effectivePercentOfSolution: item.effectivePercentOfSolution,
  });
  return jsonResponse({
    discharges: usage.discharges.map((line) => ({
      ...totals(line),
      percentOf: line.percentOf,
      effectivePercent: line.effectivePercent,
      warnings: line.warnings,
    })),
    totals: totals(usage.totals),
  });
}
