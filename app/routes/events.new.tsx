import { randomUUID } from "node:crypto";
import type { Route } from "./+types/events.new";
import { ReportForm } from "~/components/report-form";
import { requireCapability } from "~/lib/access.server";
import { reportFormOptions } from "~/models/report-options.server";
import { suggestEventNumber } from "~/models/event-number.server";
import { handleReportSubmission } from "~/models/report-form.server";

export const meta: Route.MetaFunction = () => [{ title: "New usage report · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "report.create");
  const [options, number] = await Promise.all([reportFormOptions(), suggestEventNumber()]);
  return {
    ...options,
    submissionKey: randomUUID(),
    numberSuggestion: number,
    defaultValue: {
      kind: "incident",
      discharges: [{ flowUnit: "gpm", basis: "water" }],
      dispositions: [{ disposition: "evaporated_unknown", sharePercent: "100" }],
    },
  };
}

export async function action({ request }: Route.ActionArgs) {
  return handleReportSubmission(request, () => requireCapability(request, "report.create"));
}

export default function NewReport({ loaderData, actionData }: Route.ComponentProps) {
  return (
    <div className="space-y-4">
      <h1 className="text-2xl font-bold">New usage report</h1>
      <ReportForm {...loaderData} lastResult={actionData?.result} />
    </div>
  );
}
