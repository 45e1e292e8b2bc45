import { getFormProps, getInputProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/stock.counts";
import { ErrorList, FormErrors, TextField } from "~/components/form-fields";
import { can } from "~/lib/access";
import { requireCapability } from "~/lib/access.server";
import { HELD_FOR_DISPOSAL_LABEL, UNKNOWN_LOT_LABEL } from "~/lib/foam/vocabulary";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, httpError } from "~/lib/http.server";
import { ignoredFiltersNote, queryReader } from "~/lib/query-params";
import { refusalData } from "~/lib/refusal";
import { flashHeaders } from "~/lib/session.server";
import { CountFormSchema } from "~/lib/stock/stock-forms";
import { instantToWallClock, localDateTime, wallClockToInstant } from "~/lib/time-zone";
import { readAgencySettings } from "~/models/agency-settings.server";
import {
  getStockLocation,
  listRecentCounts,
  listStockLocations,
  recordStockCount,
  stockItems,
} from "~/models/stock.server";

export const meta: Route.MetaFunction = () => [{ title: "Stock count · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "stock.read");
  const query = queryReader(new URL(request.url).searchParams);
  const locationId = query.recordId("location", "a location");
  const filterNote = ignoredFiltersNote(query.problems);
  const { timeZone } = await readAgencySettings();
  const locations = await listStockLocations();
  if (!locationId) return { location: null, locations, book: [], counts: [], now: "", canManage: false, filterNote };
  const location = await getStockLocation(locationId);
  if (!location) httpError(404, "No such location.");
  const [book, counts] = await Promise.all([stockItems({ locationId }), listRecentCounts(locationId)]);
  return {
    location,
    locations,
    book,
    counts: counts.map((count) => ({ ...count, countedAt: localDateTime(new Date(count.countedAt), timeZone) })),
    now: instantToWallClock(new Date(), timeZone),
    canManage: can(user, "stock.manage"),
    filterNote,
  };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "stock.manage");
  const formData = await readFormData(request, CountFormSchema);
  const submission = parseWithZod(formData, { schema: CountFormSchema });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 400 });
  const value = submission.value;
  const { timeZone } = await readAgencySettings();
  const outcome = await recordStockCount(
    user,
    {
      locationId: value.locationId,
      version: value.version,
      countedAt: wallClockToInstant(value.countedAt, timeZone)!,
      reason: value.reason,
      lines: value.lines.map((line) => ({
        productId: line.productId,
        lotId: line.lotId ?? null,
        countedGal: line.countedGal,
      })),
    },
    clientAddress(request),
  );
  if (outcome.kind !== "done") return refusalData(submission, outcome);
  const variance = outcome.lines.reduce((sum, line) => sum + line.varianceGal, 0);
  const message =
    variance === 0 && outcome.lines.every((line) => line.varianceGal === 0)
      ? "Count recorded: it agrees with the book."
      : `Count recorded; the variances were posted as adjustments (net ${variance.toLocaleString("en-US", { maximumFractionDigits: 2, signDisplay: "exceptZero" })} gal).`;
  throw redirect(`/stock/counts?location=${value.locationId}`, { headers: await flashHeaders(request, message) });
}

const gal = (value: number, sign = false) =>
  value.toLocaleString("en-US", { maximumFractionDigits: 2, signDisplay: sign ? "exceptZero" : "auto" });

type CountFormProps = {
  location: NonNullable<Route.ComponentProps["loaderData"]["location"]>;
  book: Route.ComponentProps["loaderData"]["book"];
  now: string;
  lastResult: NonNullable<Route.ComponentProps["actionData"]>["result"] | undefined;
};

/** The count of one location; keyed by the location and its version, so it opens on the current book. */
function CountForm({ location, book, now, lastResult }: CountFormProps) {
  const [form, fields] = useForm({
    id: "count",
    lastResult,
    constraint: getZodConstraint(CountFormSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: CountFormSchema }),
    defaultValue: {
      countedAt: now,
      lines: book.map((item) => ({
        productId: String(item.product.id),
        lotId: item.lot ? String(item.lot.id) : undefined,
        // A book below zero (use booked past the known lots) is counted from zero up.
        countedGal: String(Math.max(0, item.onHandGal)),
      })),
    },
  });
  const lines = fields.lines.getFieldList();
  return (
    <Form method="post" className="card space-y-4" {...getFormProps(form)} aria-labelledby="count-title">
      <h2 id="count-title" className="text-lg font-semibold">
        What was found
      </h2>
      <p className="text-sm text-slate-ft">
        Enter what is really there, lot by lot. Where it differs from the book, the difference is posted as an
        adjustment with the reason below.
      </p>
      <FormErrors id={form.errorId} errors={form.errors} />
      <input type="hidden" name="locationId" value={location.id} />
      <input type="hidden" name="version" value={location.version} />
      <table className="data-table">
        <thead>
          <tr>
            <th scope="col">Product</th>
            <th scope="col">Lot</th>
            <th scope="col">Book (gal)</th>
            <th scope="col">Counted (gal)</th>
          </tr>
        </thead>
        <tbody>
          {lines.map((line, index) => {
            const item = book[index];
            const parts = line.getFieldset();
            const counted = getInputProps(parts.countedGal, { type: "text" });
            return (
              <tr key={line.key}>
                <td>
                  {item?.product.name}
                  {item?.product.heldForDisposal ? ` — ${HELD_FOR_DISPOSAL_LABEL}` : ""}
                  <input type="hidden" name={parts.productId.name} value={parts.productId.initialValue ?? ""} />
                  {parts.lotId.initialValue ? (
                    <input type="hidden" name={parts.lotId.name} value={parts.lotId.initialValue} />
                  ) : null}
                </td>
                <td>{item?.lot?.number ?? UNKNOWN_LOT_LABEL}</td>
                <td>{item ? gal(item.onHandGal) : ""}</td>
                <td>
                  <label className="sr-only" htmlFor={parts.countedGal.id}>
                    Counted gallons of {item?.product.name} lot {item?.lot?.number ?? UNKNOWN_LOT_LABEL}
                  </label>
                  <input {...counted} key={counted.key} inputMode="decimal" className="field-input w-32" />
                  <ErrorList id={parts.countedGal.errorId} errors={parts.countedGal.errors} />
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <TextField label="Counted at" field={fields.countedAt} type="datetime-local" />
      <TextField
        label="Reason for any difference"
        field={fields.reason}
        autoComplete="off"
        hint="Required when the count differs from the book, e.g. a leaking drum or an unrecorded top-up."
      />
      <button type="submit" className="btn-primary">
        Record the count
      </button>
    </Form>
  );
}

export default function StockCountPage({ loaderData, actionData }: Route.ComponentProps) {
  const { location, locations, book, counts, now, canManage, filterNote } = loaderData;
  return (
    <div className="space-y-8">
      <p>
        <Link to="/stock" className="text-pond-700 underline">
          ← Concentrate stock
        </Link>
      </p>
      <h1 className="text-2xl font-bold">{location ? `Count ${location.name}` : "Count a location"}</h1>
      {filterNote ? (
        <p className="caution" role="note">
          {filterNote}
        </p>
      ) : null}
      <Form method="get" className="flex flex-wrap items-end gap-3">
        <label className="field-label" htmlFor="count-location">
          Location
        </label>
        <select id="count-location" name="location" defaultValue={location?.id ?? ""} className="field-input max-w-xs">
          <option value="">Choose a location</option>
          {locations.map((option) => (
            <option key={option.id} value={option.id}>
              {option.name}
            </option>
          ))}
        </select>
        <button type="submit" className="btn-secondary">
          Open
        </button>
      </Form>

      {location && canManage ? (
        book.length ? (
          <CountForm
            key={`${location.id}:${location.version}`}
            location={location}
            book={book}
            now={now}
            lastResult={actionData?.result}
          />
        ) : (
          <p>The book holds nothing at this location; receive or move concentrate here first.</p>
        )
      ) : null}

      {location ? (
        <section className="card overflow-x-auto" aria-labelledby="counts-title">
          <h2 id="counts-title" className="text-lg font-semibold">
            Recent counts
          </h2>
          {counts.length ? (
            counts.map((count) => (
              <div key={count.id} className="mt-3">
                <p className="font-medium">
                  {count.countedAt} by {count.countedBy}
                  {count.reason ? ` — ${count.reason}` : ""}
                </p>
                <table className="data-table mt-1">
                  <thead>
                    <tr>
                      <th scope="col">Product</th>
                      <th scope="col">Lot</th>
                      <th scope="col">Book (gal)</th>
                      <th scope="col">Counted (gal)</th>
                      <th scope="col">Variance (gal)</th>
                    </tr>
                  </thead>
                  <tbody>
                    {count.lines.map((line, index) => (
                      <tr key={index}>
                        <td>{line.productName}</td>
                        <td>{line.lotNumber ?? UNKNOWN_LOT_LABEL}</td>
                        <td>{gal(line.bookGal)}</td>
                        <td>{gal(line.countedGal)}</td>
                        <td className={line.varianceGal !== 0 ? "font-semibold" : undefined}>
                          {gal(line.varianceGal, true)}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            ))
          ) : (
            <p className="mt-2">No counts yet.</p>
          )}
        </section>
      ) : null}
    </div>
  );
}
