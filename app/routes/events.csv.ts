import type { Route } from "./+types/events.csv";
import { requireCapability } from "~/lib/access.server";
import { csvLine } from "~/lib/csv";
import { EVENT_KIND_LABELS, EVENT_STATUS_LABELS, incidentTypeLabel } from "~/lib/foam/vocabulary";
import { httpError } from "~/lib/http.server";
import { recordDownload } from "~/models/download-audit.server";
import { eachEvent, parseEventFilters } from "~/models/event-read.server";

const HEADER = [
  "number",
  "started (local)",
  "kind",
  "incident type",
  "dispatch number",
  "station",
  "status",
  "address",
  "foam classes",
  "PFAS-containing",
  "water (US gal)",
  "concentrate (US gal)",
  "foam solution (US gal)",
];

/** The events list as CSV, with the same filters and order, streamed row by row. */
export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const { filters, errors } = parseEventFilters(new URL(request.url).searchParams);
  if (Object.keys(errors).length)
    httpError(
      400,
      `Some filters cannot be used: ${Object.entries(errors)
        .map(([key, value]) => `${key}: ${value}`)
        .join(" ")}`,
    );
  await recordDownload(request, user, {
    action: "events_csv_downloaded",
    entityType: "events",
    summary: "Events list downloaded as CSV",
    details: { filters },
  });
  const encoder = new TextEncoder();
  const rows = eachEvent(user, filters);
  const body = new ReadableStream<Uint8Array>({
    start(controller) {
      controller.enqueue(encoder.encode(csvLine(HEADER)));
    },
    async pull(controller) {
      const next = await rows.next();
      if (next.done) return controller.close();
      const item = next.value;
      controller.enqueue(
        encoder.encode(
          csvLine([
            item.number,
            item.startedAt.replace("T", " "),
            EVENT_KIND_LABELS[item.kind],
            incidentTypeLabel(item.incidentType),
            item.dispatchNumber ?? "",
            item.station ?? "",
            EVENT_STATUS_LABELS[item.status],
            item.address,
            item.foamClasses.join(" "),
            item.pfasContaining ? "yes" : "no",
            item.water.toFixed(3),
            item.concentrate.toFixed(3),
            item.solution.toFixed(3),
          ]),
        ),
      );
    },
  });
  return new Response(body, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="foamtally-events-${new Date().toISOString().slice(0, 10)}.csv"`,
      "Cache-Control": "no-store",
    },
  });
}
