import type { Route } from "./+types/api.events";
import { requireCapability } from "~/lib/access.server";
import { apiError } from "~/lib/http.server";
import { apiVolume, listEvents, parseEventFilters } from "~/models/event-read.server";
import { dataVersionsForRead } from "~/models/read-versions.server";
import { handleReportApi } from "~/models/report-form.server";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "report.read");
  const url = new URL(request.url);
  const { filters, errors } = parseEventFilters(url.searchParams);
  if (Object.keys(errors).length) apiError(400, "Some filters cannot be used.", { errors });
  const page = await listEvents(user, filters, await dataVersionsForRead(request));
  return Response.json({
    page: filters.page,
    pageSize: filters.pageSize,
    count: page.count,
    totals: {
      water: apiVolume(page.totals.water),
      concentrate: apiVolume(page.totals.concentrate),
      solution: apiVolume(page.totals.solution),
    },
    items: page.items.map((item) => ({
      ...item,
      water: undefined,
      concentrate: undefined,
      solution: undefined,
      totals: {
        water: apiVolume(item.water),
        concentrate: apiVolume(item.concentrate),
        solution: apiVolume(item.solution),
      },
      url: `/events/${item.id}`,
    })),
  });
}

/** Creates a report from JSON: saved as a draft (`"intent": "save"`) or filed (`"intent": "file"`). */
export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "report.create");
  if (request.method !== "POST") apiError(405, "Use POST to create a report, PUT /api/events/:id to change one.");
  return handleReportApi(request, user);
}
