import type { Route } from "./+types/api.stock.movements";
import { requireCapability } from "~/lib/access.server";
import { fieldErrors } from "~/lib/foam/report-schema";
import { MovementQuerySchema, queryParams } from "~/lib/stock/stock-forms";
import { endOfLocalDay, startOfLocalDay } from "~/lib/time-zone";
import { readAgencySettings } from "~/models/agency-settings.server";
import { stockMovements } from "~/models/stock.server";

const KEYS = ["location", "product", "kind", "event", "from", "to"] as const;

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "stock.read");
  const query = MovementQuerySchema.safeParse(queryParams(new URL(request.url), KEYS));
  if (!query.success) {
    return Response.json(
      { error: "Some parameters cannot be used.", errors: fieldErrors(query.error) },
      { status: 400 },
    );
  }
  const { from, to } = query.data;
  if (from && to && from > to) {
    return Response.json(
      { error: "Some parameters cannot be used.", errors: { to: ["The end date is before the start date."] } },
      { status: 400 },
    );
  }
  const { timeZone } = await readAgencySettings();
  const movements = await stockMovements({
    locationId: query.data.location,
    productId: query.data.product,
    kind: query.data.kind,
    eventId: query.data.event,
    from: from ? startOfLocalDay(from, timeZone) : undefined,
    to: to ? endOfLocalDay(to, timeZone) : undefined,
  });
  return Response.json({
    items: movements.map((movement) => ({
      kind: movement.kind,
      gal: movement.gal,
      location: movement.location,
      product: movement.product,
      lot: movement.lot,
      at: movement.at,
      ...(movement.eventId ? { eventId: movement.eventId } : {}),
    })),
  });
}
