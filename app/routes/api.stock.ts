import type { Route } from "./+types/api.stock";
import { requireCapability } from "~/lib/access.server";
import { fieldErrors } from "~/lib/foam/report-schema";
import { queryParams, StockQuerySchema } from "~/lib/stock/stock-forms";
import { stockItems } from "~/models/stock.server";

export async function loader({ request }: Route.LoaderArgs) {
  await requireCapability(request, "stock.read");
  const query = StockQuerySchema.safeParse(queryParams(new URL(request.url), ["location", "product"]));
  if (!query.success) {
    return Response.json(
      { error: "Some parameters cannot be used.", errors: fieldErrors(query.error) },
      { status: 400 },
    );
  }
  const items = await stockItems({ locationId: query.data.location, productId: query.data.product });
  return Response.json({
    items: items.map((item) => ({
      location: item.location,
      product: item.product,
      lot: item.lot,
      onHandGal: item.onHandGal,
    })),
  });
}
