import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/stock";
import { FormErrors, SelectField, TextField } from "~/components/form-fields";
import { can } from "~/lib/access";
import { requireCapability } from "~/lib/access.server";
import {
  FOAM_CLASS_LABELS,
  HELD_FOR_DISPOSAL_LABEL,
  STOCK_CONTAINER_LABELS,
  STOCK_LOCATION_KIND_LABELS,
  UNKNOWN_LOT_LABEL,
} from "~/lib/foam/vocabulary";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress } from "~/lib/http.server";
import { refusalData } from "~/lib/refusal";
import { flashHeaders } from "~/lib/session.server";
import { LocationFormSchema, ReceiveFormSchema, ReorderFormSchema, STOCK_PAGE_SCHEMAS } from "~/lib/stock/stock-forms";
import {
  addStockLocation,
  listReorderPoints,
  receiveStock,
  setReorderPoint,
  stockFormOptions,
  stockItems,
  tankFill,
} from "~/models/stock.server";
import { currentStockConditions } from "~/models/stock-alerts.server";
import { stockReadiness } from "~/models/stock-readiness.server";

export const meta: Route.MetaFunction = () => [{ title: "Concentrate stock · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "stock.read");
  const [items, readiness, conditions, options, reorderPoints, tanks] = await Promise.all([
    stockItems(),
    stockReadiness(),
    currentStockConditions(),
    stockFormOptions(),
    listReorderPoints(),
    tankFill(),
  ]);
  return { items, readiness, conditions, options, reorderPoints, tanks, canManage: can(user, "stock.manage") };
}

type Intent = "receive" | "add-location" | "reorder";

export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "stock.manage");
  const formData = await readFormData(request, STOCK_PAGE_SCHEMAS);
  const intent = formData.get("intent") as Intent;
  const address = clientAddress(request);
  if (intent === "receive") {
    const submission = parseWithZod(formData, { schema: ReceiveFormSchema });
    if (submission.status !== "success") return data({ intent, result: submission.reply() }, { status: 400 });
    const value = submission.value;
    const outcome = await receiveStock(
      user,
      { ...value, manufacturedOn: value.manufacturedOn ?? null, version: value.version ?? null },
      address,
    );
    if (outcome.kind !== "done") return refusalData(submission, outcome, { intent });
    throw redirect("/stock", {
      headers: await flashHeaders(
        request,
        `Received ${value.containerCount} × ${value.containerGal} gal of lot ${value.lotNumber}.`,
      ),
    });
  }
  if (intent === "add-location") {
    const submission = parseWithZod(formData, { schema: LocationFormSchema });
    if (submission.status !== "success") return data({ intent, result: submission.reply() }, { status: 400 });
    const value = submission.value;
    const outcome = await addStockLocation(
      user,
      {
        kind: value.kind,
        name: value.name,
        stationId: value.stationId ?? null,
        apparatusId: value.apparatusId ?? null,
      },
      address,
    );
    if (outcome.kind !== "done") return refusalData(submission, outcome, { intent });
    throw redirect("/stock", { headers: await flashHeaders(request, `Added ${value.name}.`) });
  }
  const submission = parseWithZod(formData, { schema: ReorderFormSchema });
  if (submission.status !== "success")
    return data({ intent: "reorder" as const, result: submission.reply() }, { status: 400 });
  const value = submission.value;
  const outcome = await setReorderPoint(
    user,
    { locationId: value.locationId, productId: value.productId, reorderGal: value.reorderGal ?? null },
    address,
  );
  if (outcome.kind !== "done") return refusalData(submission, outcome, { intent: "reorder" as const });
  throw redirect("/stock", { headers: await flashHeaders(request, "Reorder point saved.") });
}

const gal = (value: number, digits = 1) => value.toLocaleString("en-US", { maximumFractionDigits: digits });
const today = () => new Date().toISOString().slice(0, 10);

export default function StockPage({ loaderData, actionData }: Route.ComponentProps) {
  const { items, readiness, conditions, options, reorderPoints, tanks, canManage } = loaderData;
  const resultFor = (intent: Intent) => (actionData?.intent === intent ? actionData.result : undefined);
  const locationOptions = options.locations.map((location) => ({
    value: String(location.id),
    label: `${location.name} (${STOCK_LOCATION_KIND_LABELS[location.kind]})`,
  }));
  const productOptions = options.products.map((product) => ({
    value: String(product.id),
    label: `${product.name} — ${FOAM_CLASS_LABELS[product.foamClass]}${product.heldForDisposal ? ` (${HELD_FOR_DISPOSAL_LABEL.toLowerCase()})` : ""}`,
  }));

  const [receiveForm, receive] = useForm({
    id: "receive",
    lastResult: resultFor("receive"),
    constraint: getZodConstraint(ReceiveFormSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ReceiveFormSchema }),
    defaultValue: { receivedOn: today(), container: "pail", containerCount: "1" },
  });
  const [locationForm, location] = useForm({
    id: "add-location",
    lastResult: resultFor("add-location"),
    constraint: getZodConstraint(LocationFormSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: LocationFormSchema }),
  });
  const [reorderForm, reorder] = useForm({
    id: "reorder",
    lastResult: resultFor("reorder"),
    constraint: getZodConstraint(ReorderFormSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ReorderFormSchema }),
  });

  return (
    <div className="space-y-8">
      <div className="flex flex-wrap items-baseline justify-between gap-4">
        <h1 className="text-2xl font-bold">Concentrate stock</h1>
        <p className="space-x-4">
          <Link to="/stock/movements" className="text-pond-700 underline">
            Movements
          </Link>
          <Link to="/stock/counts" className="text-pond-700 underline">
            Count a location
          </Link>
        </p>
      </div>
      <p className="caution" role="note">
        The book is what was received, moved, used on filed reports and counted. A count settles what is really there.
        Handle legacy PFAS foam held for disposal as its safety sheet says, and keep it out of use.
      </p>

      <section className="card overflow-x-auto" aria-labelledby="readiness-title">
        <h2 id="readiness-title" className="text-lg font-semibold">
          Readiness
        </h2>
        <p className="text-sm text-slate-ft">
          Minutes of a typical Class B attack: {gal(readiness.attack.solutionGpm)} gpm of foam solution at{" "}
          {gal(readiness.attack.percent, 2)} % draws {gal(readiness.attack.concentrateGpm, 2)} gpm of concentrate (an
          agency setting). Foam held for disposal is not counted as ready.
        </p>
        <table className="data-table mt-2">
          <thead>
            <tr>
              <th scope="col">Where</th>
              <th scope="col">Class A (gal)</th>
              <th scope="col">Class B (gal)</th>
              <th scope="col">Class B attack (min)</th>
              <th scope="col">Held for disposal (gal)</th>
            </tr>
          </thead>
          <tbody>
            {[...readiness.stations, readiness.district].map((row) => (
              <tr key={row.stationId ?? "district"} className={row.stationId === null ? "font-semibold" : undefined}>
                <th scope="row">{row.name}</th>
                <td>{gal(row.classAGal)}</td>
                <td>{gal(row.classBGal)}</td>
                <td>{row.classBAttackMinutes === null ? "—" : gal(row.classBAttackMinutes)}</td>
                <td>{gal(row.heldForDisposalGal)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>

      <section className="card" aria-labelledby="attention-title">
        <h2 id="attention-title" className="text-lg font-semibold">
          Needs attention
        </h2>
        {conditions.length ? (
          <ul className="mt-2 list-disc space-y-1 pl-5">
            {conditions.map((condition) => (
              <li key={condition.key}>{condition.message}</li>
            ))}
          </ul>
        ) : (
          <p className="mt-2">Nothing below a reorder point, past its shelf life or due for a sample.</p>
        )}
      </section>

      {tanks.length ? (
        <section className="card overflow-x-auto" aria-labelledby="tanks-title">
          <h2 id="tanks-title" className="text-lg font-semibold">
            Apparatus tanks
          </h2>
          <p className="mt-1 text-sm text-stone-600">
            Each is a foam system&apos;s tank; its capacity comes from the system. A transfer that would overfill it is
            refused.
          </p>
          <table className="data-table mt-2">
            <thead>
              <tr>
                <th scope="col">Tank</th>
                <th scope="col">Capacity (gal)</th>
                <th scope="col">In it (gal)</th>
                <th scope="col">Fill</th>
              </tr>
            </thead>
            <tbody>
              {tanks.map((tank) => (
                <tr key={tank.locationId}>
                  <th scope="row">{tank.name}</th>
                  <td>{tank.capacityGal === null ? "Not recorded" : gal(tank.capacityGal)}</td>
                  <td>{gal(tank.onHandGal, 2)}</td>
                  <td>
                    {tank.fillPercent === null ? "—" : `${tank.fillPercent} %`}
                    {tank.capacityGal !== null && tank.onHandGal > tank.capacityGal + 0.005 ? (
                      <span className="block text-xs text-amber-800">
                        The book is over the capacity by {gal(tank.onHandGal - tank.capacityGal, 2)} gal: refills read
                        more than the reports computed. Count the tank to settle it.
                      </span>
                    ) : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ) : null}

      <section className="card overflow-x-auto" aria-labelledby="on-hand-title">
        <h2 id="on-hand-title" className="text-lg font-semibold">
          On hand
        </h2>
        <table className="data-table mt-2">
          <thead>
            <tr>
              <th scope="col">Location</th>
              <th scope="col">Product</th>
              <th scope="col">Lot</th>
              <th scope="col">On hand (gal)</th>
            </tr>
          </thead>
          <tbody>
            {items.map((item) => (
              <tr key={`${item.location.id}-${item.product.id}-${item.lot?.id ?? "none"}`}>
                <td>
                  <Link to={`/stock/counts?location=${item.location.id}`} className="text-pond-700 underline">
                    {item.location.name}
                  </Link>
                </td>
                <td>
                  {item.product.name}
                  {item.product.heldForDisposal ? <strong> — {HELD_FOR_DISPOSAL_LABEL}</strong> : null}
                </td>
                <td>{item.lot?.number ?? UNKNOWN_LOT_LABEL}</td>
                <td className={item.onHandGal < 0 ? "font-semibold text-danger-700" : undefined}>
                  {gal(item.onHandGal, 2)}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {items.length === 0 ? <p className="mt-2">No concentrate is booked yet.</p> : null}
      </section>

      {reorderPoints.length ? (
        <section className="card overflow-x-auto" aria-labelledby="reorder-title">
          <h2 id="reorder-title" className="text-lg font-semibold">
            Reorder points
          </h2>
          <table className="data-table mt-2">
            <thead>
              <tr>
                <th scope="col">Location</th>
                <th scope="col">Product</th>
                <th scope="col">Reorder at (gal)</th>
                <th scope="col">On hand (gal)</th>
              </tr>
            </thead>
            <tbody>
              {reorderPoints.map((point) => (
                <tr key={`${point.locationId}-${point.productId}`}>
                  <td>{point.locationName}</td>
                  <td>{point.productName}</td>
                  <td>{gal(point.reorderGal)}</td>
                  <td className={point.onHandGal < point.reorderGal ? "font-semibold text-danger-700" : undefined}>
                    {gal(point.onHandGal)}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ) : null}

      {canManage ? (
        <div className="grid gap-6 lg:grid-cols-2">
          <Form method="post" className="card space-y-4" {...getFormProps(receiveForm)} aria-labelledby="receive-title">
            <h2 id="receive-title" className="text-lg font-semibold">
              Receive a delivery
            </h2>
            <FormErrors id={receiveForm.errorId} errors={receiveForm.errors} />
            <input type="hidden" name="intent" value="receive" />
            <SelectField
              label="Into"
              field={receive.locationId}
              options={locationOptions}
              placeholder="Choose a location"
            />
            <SelectField
              label="Product"
              field={receive.productId}
              options={productOptions}
              placeholder="Choose a product"
            />
            <TextField label="Lot number" field={receive.lotNumber} autoComplete="off" />
            <TextField
              label="Manufactured"
              field={receive.manufacturedOn}
              type="date"
              hint="From the container label; sets the shelf-life date."
            />
            <div className="grid gap-4 sm:grid-cols-3">
              <SelectField
                label="Container"
                field={receive.container}
                options={Object.entries(STOCK_CONTAINER_LABELS).map(([value, label]) => ({ value, label }))}
              />
              <TextField label="Container size (gal)" field={receive.containerGal} inputMode="decimal" />
              <TextField label="How many" field={receive.containerCount} inputMode="numeric" />
            </div>
            <TextField label="Supplier" field={receive.supplier} autoComplete="off" />
            <TextField
              label="Delivery reference"
              field={receive.deliveryReference}
              autoComplete="off"
              hint="Packing slip or invoice number."
            />
            <TextField label="Received" field={receive.receivedOn} type="date" />
            <button type="submit" className="btn-primary">
              Book the delivery
            </button>
          </Form>

          <div className="space-y-6">
            <Form
              method="post"
              className="card space-y-4"
              {...getFormProps(locationForm)}
              aria-labelledby="location-title"
            >
              <h2 id="location-title" className="text-lg font-semibold">
                Add a location
              </h2>
              <FormErrors id={locationForm.errorId} errors={locationForm.errors} />
              <input type="hidden" name="intent" value="add-location" />
              <SelectField
                label="Kind"
                field={location.kind}
                options={Object.entries(STOCK_LOCATION_KIND_LABELS).map(([value, label]) => ({ value, label }))}
                placeholder="Choose a kind"
              />
              <TextField label="Name" field={location.name} autoComplete="off" />
              <SelectField
                label="Station"
                field={location.stationId}
                options={options.stations.map((station) => ({ value: String(station.id), label: station.label }))}
                placeholder="None (district-wide)"
              />
              <SelectField
                label="Apparatus (for a tank)"
                field={location.apparatusId}
                options={options.apparatus.map((unit) => ({ value: String(unit.id), label: unit.label }))}
                placeholder="None"
                hint="A tank is made for an apparatus the first time a filed report or a refill needs it."
              />
              <button type="submit" className="btn-secondary">
                Add the location
              </button>
            </Form>

            <Form
              method="post"
              className="card space-y-4"
              {...getFormProps(reorderForm)}
              aria-labelledby="reorder-form-title"
            >
              <h2 id="reorder-form-title" className="text-lg font-semibold">
                Set a reorder point
              </h2>
              <FormErrors id={reorderForm.errorId} errors={reorderForm.errors} />
              <input type="hidden" name="intent" value="reorder" />
              <SelectField
                label="Location"
                field={reorder.locationId}
                options={locationOptions}
                placeholder="Choose a location"
              />
              <SelectField
                label="Product"
                field={reorder.productId}
                options={productOptions}
                placeholder="Choose a product"
              />
              <TextField
                label="Reorder at (gal)"
                field={reorder.reorderGal}
                inputMode="decimal"
                hint="Leave blank to remove the point."
              />
              <button type="submit" className="btn-secondary">
                Save the reorder point
              </button>
            </Form>
          </div>
        </div>
      ) : null}
    </div>
  );
}
