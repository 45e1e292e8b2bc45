import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { useState } from "react";
import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/stock.movements";
import { DisposalManifests } from "~/components/attachments-panel";
import { FormErrors, SelectField, TextField } from "~/components/form-fields";
import { can } from "~/lib/access";
import { requireCapability } from "~/lib/access.server";
import { STOCK_MOVEMENT_KIND_LABELS, UNKNOWN_LOT_LABEL } from "~/lib/foam/vocabulary";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, httpError } from "~/lib/http.server";
import { ignoredFiltersNote, queryReader } from "~/lib/query-params";
import { refusalData } from "~/lib/refusal";
import { flashHeaders } from "~/lib/session.server";
import { MoveFormSchema } from "~/lib/stock/stock-forms";
import { instantToWallClock, localDateTime, wallClockToInstant } from "~/lib/time-zone";
import { readAgencySettings } from "~/models/agency-settings.server";
import { listAttachmentsOf } from "~/models/attachments.server";
import { getStockLocation, moveStock, stockFormOptions, stockItems, stockMovements } from "~/models/stock.server";

export const meta: Route.MetaFunction = () => [{ title: "Stock movements · Foamtally" }];

/** The page lists the newest movements; `GET /api/stock/movements` gives every one. */
const PAGE_ROWS = 300;

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "stock.read");
  const query = queryReader(new URL(request.url).searchParams);
  const locationId = query.recordId("location", "a location");
  const location = locationId ? await getStockLocation(locationId) : null;
  if (locationId && !location) httpError(404, "No such location.");
  const [movements, options, held, { timeZone }] = await Promise.all([
    stockMovements(locationId ? { locationId } : {}),
    stockFormOptions(),
    locationId ? stockItems({ locationId }) : Promise.resolve([]),
    readAgencySettings(),
  ]);
  const shown = movements.slice(-PAGE_ROWS).reverse();
  const manifests = await listAttachmentsOf(
    "stock_movement",
    shown.filter((movement) => movement.kind === "disposed").map((movement) => movement.id),
  );
  return {
    location,
    held,
    options,
    timeZone,
    now: instantToWallClock(new Date(), timeZone),
    movements: shown.map((movement) => ({
      ...movement,
      at: localDateTime(new Date(movement.at), timeZone),
      manifests: (manifests.get(movement.id) ?? []).map(({ id, name, url }) => ({ id, name, url })),
    })),
    canManage: can(user, "stock.manage"),
    filterNote: ignoredFiltersNote(query.problems),
  };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "stock.manage");
  const formData = await readFormData(request, MoveFormSchema);
  const submission = parseWithZod(formData, { schema: MoveFormSchema });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 400 });
  const value = submission.value;
  const { timeZone } = await readAgencySettings();
  const outcome = await moveStock(
    user,
    {
      kind: value.kind,
      locationId: value.locationId,
      toLocationId: value.toLocationId ?? null,
      version: value.version,
      productId: value.productId,
      lotId: value.lotId ?? null,
      gal: value.gal,
      at: wallClockToInstant(value.at, timeZone)!,
      reason: value.reason,
      reference: value.reference,
    },
    clientAddress(request),
  );
  if (outcome.kind !== "done") return refusalData(submission, outcome);
  throw redirect(`/stock/movements?location=${value.locationId}`, {
    headers: await flashHeaders(request, `${STOCK_MOVEMENT_KIND_LABELS[value.kind]}: ${value.gal} gal booked.`),
  });
}

const gal = (value: number) => value.toLocaleString("en-US", { maximumFractionDigits: 2, signDisplay: "exceptZero" });

export default function StockMovementsPage({ loaderData, actionData }: Route.ComponentProps) {
  const { location, held, options, movements, canManage, now, filterNote } = loaderData;
  const [form, fields] = useForm({
    id: "move",
    lastResult: actionData?.result,
    constraint: getZodConstraint(MoveFormSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: MoveFormSchema }),
    defaultValue: { kind: "transferred", at: now },
  });
  const heldProducts = [...new Map(held.map((item) => [item.product.id, item.product])).values()];
  const heldLots = held.filter((item) => item.lot && item.onHandGal > 0);
  return (
    <div className="space-y-8">
      <p>
        <Link to="/stock" className="text-pond-700 underline">
          ← Concentrate stock
        </Link>
      </p>
      <h1 className="text-2xl font-bold">{location ? `Movements at ${location.name}` : "Stock movements"}</h1>
      {filterNote ? (
        <p className="caution" role="note">
          {filterNote}
        </p>
      ) : null}

      <Form method="get" className="flex flex-wrap items-end gap-3">
        <label className="field-label" htmlFor="location-filter">
          Location
        </label>
        <select id="location-filter" name="location" defaultValue={location?.id ?? ""} className="field-input max-w-xs">
          <option value="">Every location</option>
          {options.locations.map((option) => (
            <option key={option.id} value={option.id}>
              {option.name}
            </option>
          ))}
        </select>
        <button type="submit" className="btn-secondary">
          Show
        </button>
      </Form>

      {canManage && location ? (
        <Form method="post" className="card max-w-2xl space-y-4" {...getFormProps(form)} aria-labelledby="move-title">
          <h2 id="move-title" className="text-lg font-semibold">
            Move concentrate out of {location.name}
          </h2>
          <FormErrors id={form.errorId} errors={form.errors} />
          <input type="hidden" name="locationId" value={location.id} />
          <input type="hidden" name="version" value={location.version} />
          <SelectField
            label="What is done"
            field={fields.kind}
            options={[
              { value: "transferred", label: "Transfer to another location (e.g. refill a tank)" },
              { value: "sampled", label: "Quality sample sent for testing" },
              { value: "disposed", label: "Sent for disposal (hauler)" },
            ]}
          />
          <SelectField
            label="To (for a transfer)"
            field={fields.toLocationId}
            options={options.locations
              .filter((option) => option.id !== location.id)
              .map((option) => ({ value: String(option.id), label: option.name }))}
            placeholder="Choose where it goes"
          />
          <SelectField
            label="Product"
            field={fields.productId}
            options={heldProducts.map((product) => ({
              value: String(product.id),
              label: `${product.name}${product.heldForDisposal ? " (held for disposal: disposal only)" : ""}`,
            }))}
            placeholder="Choose a product held here"
          />
          <SelectField
            label="Lot"
            field={fields.lotId}
            options={heldLots.map((item) => ({
              value: String(item.lot!.id),
              label: `${item.lot!.number} — ${item.product.name}, ${item.onHandGal} gal`,
            }))}
            placeholder="Oldest first"
          />
          <TextField label="Quantity (gal)" field={fields.gal} inputMode="decimal" />
          <TextField label="When" field={fields.at} type="datetime-local" />
          <TextField label="Reason or note" field={fields.reason} autoComplete="off" />
          <TextField
            label="Reference"
            field={fields.reference}
            autoComplete="off"
            hint="The hauler's manifest number for disposal (required), the lab's sample number for a sample."
          />
          <button type="submit" className="btn-primary">
            Book the movement
          </button>
        </Form>
      ) : canManage ? (
        <p>Choose a location above to move, sample or dispose of what it holds.</p>
      ) : null}

      <section className="card overflow-x-auto" aria-labelledby="movements-title">
        <h2 id="movements-title" className="text-lg font-semibold">
          Movements, newest first
        </h2>
        <table className="data-table mt-2">
          <thead>
            <tr>
              <th scope="col">When</th>
              <th scope="col">Kind</th>
              <th scope="col">Location</th>
              <th scope="col">Product</th>
              <th scope="col">Lot</th>
              <th scope="col">Gallons</th>
              <th scope="col">Report, reason or reference</th>
            </tr>
          </thead>
          <tbody>
            {movements.map((movement) => (
              <tr key={movement.id}>
                <td>{movement.at}</td>
                <td>{STOCK_MOVEMENT_KIND_LABELS[movement.kind]}</td>
                <td>{movement.location.name}</td>
                <td>{movement.product.name}</td>
                <td>{movement.lot?.number ?? UNKNOWN_LOT_LABEL}</td>
                <td>{gal(movement.gal)}</td>
                <td>
                  {movement.eventId ? (
                    <Link to={`/events/${movement.eventId}`} className="text-pond-700 underline">
                      {movement.eventNumber}
                    </Link>
                  ) : null}
                  {movement.eventId ? "" : [movement.reason, movement.reference].filter(Boolean).join(" · ")}
                  {movement.kind === "disposed" ? (
                    <ManifestCell movementId={movement.id} manifests={movement.manifests} />
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {movements.length === 0 ? <p className="mt-2">No movements yet.</p> : null}
      </section>
    </div>
  );
}

/**
 * A disposal's manifests: their names as links, and (opened on demand, so a long list does not ask
 * for every disposal's files at once) the attachments panel to add or remove one.
 */
function ManifestCell({
  movementId,
  manifests,
}: {
  movementId: number;
  manifests: Array<{ id: number; name: string; url: string }>;
}) {
  const [open, setOpen] = useState(false);
  return (
    <div className="mt-1 text-sm" data-testid="disposal-manifests">
      {manifests.length === 0 ? (
        <span className="caution">No manifest attached</span>
      ) : (
        <span>
          Manifest:{" "}
          {manifests.map((manifest, index) => (
            <span key={manifest.id}>
              {index > 0 ? ", " : ""}
              <a href={manifest.url} className="text-pond-700 underline" target="_blank" rel="noreferrer">
                {manifest.name}
              </a>
            </span>
          ))}
        </span>
      )}
      <details className="mt-1" onToggle={(event) => setOpen(event.currentTarget.open)}>
        <summary className="cursor-pointer underline">Manifest files</summary>
        {open ? <DisposalManifests movementId={movementId} /> : null}
      </details>
    </div>
  );
}
