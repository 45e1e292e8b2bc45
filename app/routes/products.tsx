import { Link } from "react-router";
import type { Route } from "./+types/products";
import { requireCapability } from "~/lib/access.server";
import { foamClassAndTypeLabel, PFAS_CONTENT_UNIT_LABELS } from "~/lib/foam/vocabulary";
import { can } from "~/lib/access";
import { listProducts } from "~/models/product.server";

export const meta: Route.MetaFunction = () => [{ title: "Foam products · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "catalogue.read");
  return { products: await listProducts(), canEdit: can(user, "catalogue.edit") };
}

export default function Products({ loaderData }: Route.ComponentProps) {
  const { products, canEdit } = loaderData;
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-2xl font-bold">Foam products</h1>
        {canEdit ? (
          <Link to="/products/new" className="btn-primary">
            Add a product
          </Link>
        ) : null}
      </div>
      <p className="caution">
        PFAS-containing concentrates (legacy AFFF and others) must be kept out of drains, soil and waterways; collect
        and dispose of them through your agency&apos;s licensed route. PFAS figures here are as good as their source.
      </p>
      <section className="card overflow-x-auto" aria-labelledby="products-title">
        <h2 id="products-title" className="sr-only">
          Products
        </h2>
        {products.length === 0 ? (
          <p>No foam products yet.</p>
        ) : (
          <table className="data-table">
            <thead>
              <tr>
                <th scope="col">Product</th>
                <th scope="col">Class and type</th>
                <th scope="col">Nominal %</th>
                <th scope="col">PFAS</th>
                <th scope="col">Cost per gal</th>
                <th scope="col">Safety sheet</th>
                <th scope="col">Status</th>
              </tr>
            </thead>
            <tbody>
              {products.map((product) => (
                <tr key={product.id}>
                  <td>
                    <Link to={`/products/${product.id}`} className="font-medium text-pond-700 underline">
                      {product.name}
                    </Link>
                    {product.maker ? <span className="block text-xs text-slate-ft">{product.maker}</span> : null}
                  </td>
                  <td>{foamClassAndTypeLabel(product.foamClass, product.foamType)}</td>
                  <td>{product.nominalPercents.join(", ")}</td>
                  <td>
                    {product.pfasContaining ? (
                      <span className="font-semibold text-danger-700">
                        Contains PFAS
                        {product.pfasContent != null && product.pfasContentUnit
                          ? ` (${product.pfasContent} ${PFAS_CONTENT_UNIT_LABELS[product.pfasContentUnit]})`
                          : ""}
                      </span>
                    ) : (
                      "No"
                    )}
                  </td>
                  <td>{product.unitCostPerGal != null ? `$${product.unitCostPerGal.toFixed(2)}` : "—"}</td>
                  <td>
                    {product.hasSafetySheet ? (
                      <a href={`/products/${product.id}/safety-sheet`} className="text-pond-700 underline">
                        {product.safetySheetName}
                      </a>
                    ) : (
                      "—"
                    )}
                  </td>
                  <td>{product.active ? "Active" : "Retired"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </div>
  );
}
