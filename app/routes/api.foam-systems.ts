import type { Route } from "./+types/api.foam-systems";
import { requireCapability } from "~/lib/access.server";
import { listFleet } from "~/models/foam-system.server";

/** Every active foam system, out of tolerance and overdue first. */
export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "systems.read");
  const items = await listFleet();
  return Response.json({
    items: items.map((item) => ({
      id: item.id,
      apparatus: item.apparatus,
      type: item.type,
      percentOf: item.percentOf,
      lastFlushAt: item.lastFlushAt?.toISOString() ?? null,
      lastTestAt: item.lastTestAt?.toISOString() ?? null,
      lastTestPass: item.lastTestPass,
      nextTestDue: item.nextTestDue,
      status: item.status,
    })),
  });
}
