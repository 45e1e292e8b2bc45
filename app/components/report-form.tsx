import {
  FormProvider,
  getFormProps,
  getInputProps,
  getTextareaProps,
  useField,
  useForm,
  type SubmissionResult,
} from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useEffect, useMemo, useRef, useState } from "react";
import { Form, useFetcher, useNavigation } from "react-router";
import type { z } from "zod";
import {
  DischargeLineSchema,
  DraftPayloadSchema,
  FiledReportSchema,
  MAX_DISCHARGE_MINUTES,
  MAX_LINES,
  MAX_RUNOFF_LINES,
  MAX_TANK_READINGS,
  minutesBetween,
} from "~/lib/foam/report-schema";
import type { UsageWarning } from "~/lib/foam/totals";
import { FLOW_UNITS } from "~/lib/foam/units";
import {
  APPLICATION_METHOD_LABELS,
  APPLICATION_METHODS,
  DISPOSITION_LABELS,
  DISPOSITIONS,
  EVENT_KIND_LABELS,
  EVENT_KINDS,
  FLOW_BASIS_LABELS,
  FLOW_UNIT_LABELS,
  FOAM_CLASS_LABELS,
  defaultPercentOf,
  PERCENT_OF,
  PERCENT_OF_LABELS,
  VOLUME_LABELS,
  VOLUMES,
  WATER_ONLY_LABEL,
  DEFAULT_INCIDENT_TYPE,
  INCIDENT_TYPE_LABELS,
  INCIDENT_TYPES_BY_KIND,
  type EventKind,
  type EventStatus,
  type IncidentType,
  type FlowBasis,
  type ProportionerType,
  type FoamClass,
  type PercentOf,
} from "~/lib/foam/vocabulary";
import type { FieldEntries } from "~/lib/unsaved-copy";
import { ErrorSummary } from "./error-summary";
import { EventLocationMap } from "./event-location-map";
import { ErrorList, FormErrors, SelectField, TextField } from "./form-fields";
import { MutualAidFields, MutualAidSwitch } from "./mutual-aid-fields";
import { fillFields, LeaveDialog, UnsavedCopyOffer, useUnsavedReportCopy } from "./unsaved-copy";
import { UsageCautions } from "./usage-cautions";

export type ProductOption = {
  id: number;
  name: string;
  foamClass: FoamClass;
  nominalPercents: number[];
  pfasContaining: boolean;
  heldForDisposal?: boolean;
};
export type OutletOption = {
  name: string;
  foamCapable: boolean;
  defaultFlowGpm: number | null;
  defaultFlowBasis: FlowBasis;
  defaultMethod: string | null;
};
export type ApparatusOption = {
  id: number;
  unitId: string;
  description: string;
  compressedAirCfm: number | null;
  proportionerType?: ProportionerType | null;
  outlets: OutletOption[];
  /** Its foam systems and the outlets each serves: the line's outlet picks one. */
  foamSystems?: FoamSystemOption[];
};
export type FoamSystemOption = {
  id: number;
  name: string;
  percentOf: PercentOf;
  outlets: string[];
  outOfTolerance: boolean;
};

/** The system a typed outlet names, as the server picks it (`foamSystemFor` in totals.ts). */
function systemForOutlet(unit: ApparatusOption | undefined, outlet: string | undefined) {
  const systems = unit?.foamSystems ?? [];
  const name = outlet?.trim().toLowerCase();
  const serving = name ? systems.find((system) => system.outlets.some((item) => item.toLowerCase() === name)) : null;
  return serving ?? (systems.length === 1 ? systems[0] : null);
}
export type StationOption = { id: number; code: string; name: string };

export type ReportFormProps = {
  lastResult?: SubmissionResult<string[]> | null;
  defaultValue: Record<string, unknown>;
  version?: number;
  status?: EventStatus;
  submissionKey: string;
  timeZone: string;
  stations: StationOption[];
  apparatus: ApparatusOption[];
  products: ProductOption[];
  /** The number a new report gets when the field is left blank (nothing is reserved). */
  numberSuggestion?: string;
  /** A reviewer changing a report someone else filed gives a reason (`changeReasonFor`). */
  reasonRequired?: boolean;
  /** When the report was last saved (an ISO instant), for a report that has been. */
  savedAt?: string | null;
  /** Photos attached to the report whose recorded position the officer chose to keep. */
  photoPositions?: PhotoPositionOption[];
};

export type PhotoPositionOption = { id: number; name: string; latitude: number; longitude: number };

type TotalsVolume = { gal: number; L: number };
type TotalsResponse = {
  discharges?: Array<{
    water: TotalsVolume;
    concentrate: TotalsVolume;
    solution: TotalsVolume;
    effectivePercent: number | null;
    effectivePercentOfSolution: number | null;
    warnings: UsageWarning[];
  }>;
  totals?: { water: TotalsVolume; concentrate: TotalsVolume; solution: TotalsVolume };
  error?: string;
};

type ReportShape = z.input<typeof FiledReportSchema>;

const NEW_DISCHARGE = { flowUnit: "gpm", basis: "water" };
const NEW_DISPOSITION = { disposition: "evaporated_unknown" };

const number = (value: unknown) => {
  if (typeof value !== "string" || value.trim() === "") return undefined;
  const parsed = Number(value);
  return Number.isFinite(parsed) ? parsed : undefined;
};

/** Why a typed line cannot be computed yet, in the officer's words; null when it can. */
function lineLeftOutBecause(raw: unknown, timeZone: string): string | null {
  const line = (raw ?? {}) as Record<string, string | undefined>;
  const flow = number(line.flow);
  const minutes = number(line.minutes) ?? minutesBetween(line.startedAt, line.endedAt, timeZone) ?? undefined;
  const percent = number(line.percent);
  if (!flow || flow <= 0) return "it has no valid flow";
  if (!minutes || minutes <= 0 || minutes > MAX_DISCHARGE_MINUTES) return "it has no valid duration";
  if (number(line.productId) && (!percent || percent <= 0 || percent >= 100)) {
    return "its concentrate has no valid percent";
  }
  return null;
}

/** The lines complete enough for the server to compute, with their place in the form. */
function computableLines(
  lines: unknown,
  apparatusById: ReadonlyMap<number, ApparatusOption>,
  timeZone: string,
): Array<{ index: number; line: Record<string, unknown> }> {
  if (!Array.isArray(lines)) return [];
  return lines.flatMap((raw, index) => {
    const line = (raw ?? {}) as Record<string, string | undefined>;
    const flow = number(line.flow);
    const minutes = number(line.minutes) ?? minutesBetween(line.startedAt, line.endedAt, timeZone) ?? undefined;
    const productId = number(line.productId);
    const percent = number(line.percent);
    if (lineLeftOutBecause(raw, timeZone) !== null || !flow || !minutes) return [];
    const basis = line.basis === "solution" ? "solution" : "water";
    const unit = apparatusById.get(number(line.apparatusId) ?? 0);
    const percentOf =
      line.percentOf === "solution" || line.percentOf === "water"
        ? line.percentOf
        : (systemForOutlet(unit, line.outlet)?.percentOf ?? defaultPercentOf(basis, unit?.proportionerType));
    return [
      {
        index,
        line: {
          flow,
          flowUnit: line.flowUnit === "lpm" ? "lpm" : "gpm",
          basis,
          percent: productId ? percent : null,
          percentOf,
          minutes,
          productId: productId ?? null,
          apparatusId: number(line.apparatusId) ?? null,
          outlet: line.outlet?.trim() || undefined,
        },
      },
    ];
  });
}

function formatGallons(value: number | undefined) {
  return value == null ? "—" : value.toLocaleString("en-US", { maximumFractionDigits: 2 });
}

export function ReportForm(props: ReportFormProps) {
  const navigation = useNavigation();
  const totalsFetcher = useFetcher<TotalsResponse>();
  const [form, fields] = useForm<ReportShape>({
    id: "usage-report",
    lastResult: props.lastResult,
    defaultValue: props.defaultValue as never,
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate({ formData }) {
      // A draft is kept as typed; only filing is checked.
      if (formData.get("intent") === "save-draft")
        return parseWithZod(formData, { schema: DraftPayloadSchema }) as never;
      return parseWithZod(formData, { schema: FiledReportSchema });
    },
  });
  const kind: EventKind = EVENT_KINDS.includes(fields.kind.value as EventKind)
    ? (fields.kind.value as EventKind)
    : "incident";
  const discharges = fields.discharges.getFieldList();
  const dispositions = fields.dispositions.getFieldList();
  const tankReadings = fields.tankReadings.getFieldList();
  const productsById = useMemo(() => new Map(props.products.map((product) => [product.id, product])), [props.products]);
  // A photo's position the officer asked for: placed on the map and in the fields, saved as typed.
  const [placeAt, setPlaceAt] = useState<{ latitude: number; longitude: number } | null>(null);
  const apparatusById = useMemo(() => new Map(props.apparatus.map((unit) => [unit.id, unit])), [props.apparatus]);

  // Live totals from the server, debounced while the officer types.
  const lines = useMemo(
    () => computableLines(form.value?.discharges, apparatusById, props.timeZone),
    [form.value?.discharges, apparatusById, props.timeZone],
  );
  const request = JSON.stringify({ discharges: lines.map((entry) => entry.line) });
  const submitTotals = totalsFetcher.submit;
  const lastRequest = useRef<string>("");
  useEffect(() => {
    if (lines.length === 0 || request === lastRequest.current) return;
    const timer = setTimeout(() => {
      lastRequest.current = request;
      submitTotals(request, { method: "post", action: "/api/totals", encType: "application/json" });
    }, 350);
    return () => clearTimeout(timer);
  }, [request, lines.length, submitTotals]);
  const computed = lines.length ? totalsFetcher.data : undefined;
  const resultFor = (index: number) => {
    const place = lines.findIndex((entry) => entry.index === index);
    return place >= 0 && computed?.discharges ? computed.discharges[place] : undefined;
  };
  const typedLines = Array.isArray(form.value?.discharges) ? form.value.discharges : [];
  const chosenProducts = typedLines.map((line) => productsById.get(Number(line?.productId)));
  const pfasChosen = chosenProducts.some((product) => product?.pfasContaining);
  const classAChosen = chosenProducts.some((product) => product?.foamClass === "A");
  const saving = navigation.state === "submitting" && navigation.formAction?.includes("/events");
  const accepted = props.status === "accepted";
  const leftOut = typedLines.flatMap((line, index) => {
    const because = lineLeftOutBecause(line, props.timeZone);
    return because ? [{ index, because }] : [];
  });

  // The unsaved copy kept in this browser: offered when the form opens, put back on request.
  const [pendingFill, setPendingFill] = useState<FieldEntries | null>(null);
  const copy = useUnsavedReportCopy({
    formId: form.id,
    baseVersion: props.version,
    onRestore(entries) {
      const formData = new FormData();
      for (const [name, value] of entries) formData.append(name, value);
      form.update({ value: parseWithZod(formData, { schema: DraftPayloadSchema }).payload as never });
      setPendingFill(entries);
    },
  });
  useEffect(() => {
    const element = document.getElementById(form.id);
    if (!pendingFill || !(element instanceof HTMLFormElement)) return;
    fillFields(element, pendingFill);
    setPendingFill(null);
  }, [pendingFill, form.id]);

  // Each refused filing (in the browser or by the server) brings the summary of what to fix.
  const [filingAttempt, setFilingAttempt] = useState(0);
  useEffect(() => {
    const fieldErrors = Object.entries(props.lastResult?.error ?? {}).some(([name, errors]) => name && errors?.length);
    if (props.lastResult?.status === "error" && fieldErrors) setFilingAttempt((attempt) => attempt + 1);
  }, [props.lastResult]);
  const formProps = getFormProps(form);

  // The bar's height, so that a focused field scrolls clear of it (`scroll-padding` in app.css).
  const actionsBar = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const bar = actionsBar.current;
    if (!bar || typeof ResizeObserver === "undefined") return;
    const root = document.documentElement;
    const observer = new ResizeObserver(() =>
      root.style.setProperty("--report-actions-height", `${bar.offsetHeight}px`),
    );
    observer.observe(bar);
    return () => {
      observer.disconnect();
      root.style.removeProperty("--report-actions-height");
    };
  }, []);

  return (
    <FormProvider context={form.context}>
      {copy.offer ? (
        <UnsavedCopyOffer
          copy={copy.offer}
          timeZone={props.timeZone}
          currentVersion={props.version}
          onRestore={copy.restore}
          onDiscard={copy.discard}
        />
      ) : null}
      <LeaveDialog blocker={copy.blocker} />
      <Form
        method="post"
        {...formProps}
        onSubmit={(event) => {
          formProps.onSubmit(event);
          const submitter = (event.nativeEvent as SubmitEvent).submitter as HTMLButtonElement | null;
          // Refused in the browser: the form library stopped the submission.
          if (event.defaultPrevented && submitter?.name === "intent" && submitter.value === "file") {
            setFilingAttempt((attempt) => attempt + 1);
          }
        }}
        className="report-form space-y-6"
        aria-describedby={form.errorId}
      >
        <input type="hidden" name="submissionKey" value={props.submissionKey} />
        {props.version ? <input type="hidden" name="version" value={props.version} /> : null}
        <FormErrors id={form.errorId} errors={form.errors} />
        <ErrorSummary formId={form.id} errors={form.allErrors} attempt={filingAttempt} />

        <section className="card space-y-4" aria-labelledby="details-title">
          <h2 id="details-title" className="text-lg font-semibold">
            Event
          </h2>
          <div className="grid gap-4 md:grid-cols-3">
            <TextField
              label="Event number"
              field={fields.number}
              hintBelow
              hint={
                props.numberSuggestion
                  ? `Foamtally's own number; leave it blank and the next one (${props.numberSuggestion}) is given when you save.`
                  : "Foamtally's own number for this report."
              }
            />
            <TextField
              label="Dispatch (CAD) number"
              field={fields.dispatchNumber}
              hintBelow
              hint="The incident number from dispatch, if there is one."
            />
            <SelectField
              label="Station"
              field={fields.stationId}
              placeholder="Choose the station"
              options={choices(
                props.stations.map((station) => [String(station.id), `${station.code} ${station.name}`]),
              )}
            />
            <SelectField
              label="Kind"
              field={fields.kind}
              options={choices(EVENT_KINDS.map((kind) => [kind, EVENT_KIND_LABELS[kind]]))}
              onChange={(event) => {
                const kind = event.currentTarget.value as EventKind;
                const type = fields.incidentType.value as IncidentType | undefined;
                if (type && !INCIDENT_TYPES_BY_KIND[kind]?.includes(type)) {
                  form.update({ name: fields.incidentType.name, value: "" });
                }
              }}
            />
            <SelectField
              label="Incident type"
              field={fields.incidentType}
              placeholder={
                DEFAULT_INCIDENT_TYPE[kind] ? INCIDENT_TYPE_LABELS[DEFAULT_INCIDENT_TYPE[kind]] : "Not recorded"
              }
              options={choices(INCIDENT_TYPES_BY_KIND[kind].map((type) => [type, INCIDENT_TYPE_LABELS[type]]))}
            />
            <TextField label="Address or location" field={fields.address} />
            <TextField
              label="Started"
              field={fields.startedAt}
              type="datetime-local"
              hintBelow
              hint={`Local time, ${props.timeZone}.`}
            />
            <TextField
              label="Cleared"
              field={fields.clearedAt}
              type="datetime-local"
              hintBelow
              hint={`Local time, ${props.timeZone}.`}
            />
          </div>
          {props.photoPositions && props.photoPositions.length > 0 ? (
            <PhotoPositions photos={props.photoPositions} onUse={setPlaceAt} />
          ) : null}
          <EventLocationMap
            placeAt={placeAt}
            // Drawn from its own state: a restored copy gives it new starting values.
            key={`${fields.latitude.key}:${fields.longitude.key}`}
            defaultLatitude={fields.latitude.initialValue}
            defaultLongitude={fields.longitude.initialValue}
            latitudeName={fields.latitude.name}
            longitudeName={fields.longitude.name}
            latitudeErrors={fields.latitude.errors}
            longitudeErrors={fields.longitude.errors}
            onChange={(point) => {
              if (point.address && !fields.address.value)
                form.update({ name: fields.address.name, value: point.address });
            }}
          />
          <div>
            <label htmlFor={fields.narrative.id} className="field-label">
              Narrative
            </label>
            <textarea
              {...getTextareaProps(fields.narrative)}
              key={fields.narrative.key}
              rows={3}
              className="field-input"
            />
            <ErrorList id={fields.narrative.errorId} errors={fields.narrative.errors} />
          </div>
        </section>

        <section className="card space-y-4" aria-labelledby="discharges-title">
          <div className="flex flex-wrap items-center justify-between gap-2">
            <h2 id="discharges-title" className="text-lg font-semibold">
              Discharges
            </h2>
            <button
              type="submit"
              className="btn-secondary"
              disabled={discharges.length >= MAX_LINES}
              {...form.insert.getButtonProps({ name: fields.discharges.name, defaultValue: NEW_DISCHARGE as never })}
            >
              Add a discharge
            </button>
          </div>
          <p className="text-sm text-slate-ft">
            One line per hose line, monitor or test that flowed. Say whether the flow figure is water through a
            direct-injection proportioner or the foam-solution rating of a nozzle or eductor.
          </p>
          <ErrorList id={fields.discharges.errorId} errors={fields.discharges.errors} />
          {pfasChosen ? <UsageCautions kind="pfas" /> : null}
          {classAChosen ? <UsageCautions kind="class-a" /> : null}
          <ol className="space-y-4">
            {discharges.map((line, index) => (
              <DischargeLine
                key={line.key}
                name={line.name}
                index={index}
                listName={fields.discharges.name}
                full={discharges.length >= MAX_LINES}
                result={resultFor(index)}
                leftOutBecause={leftOut.find((entry) => entry.index === index)?.because}
                apparatus={props.apparatus}
                products={props.products}
                apparatusById={apparatusById}
                productsById={productsById}
              />
            ))}
          </ol>
        </section>

        <section className="card" aria-labelledby="totals-title" aria-live="polite">
          <h2 id="totals-title" className="text-lg font-semibold">
            Totals <span className="text-sm font-normal text-slate-ft">(computed by the server as you type)</span>
          </h2>
          <dl className="mt-3 grid grid-cols-3 gap-4" data-testid="live-totals">
            {VOLUMES.map((key) => (
              <div key={key} className="rounded-md bg-stone-100 p-3">
                <dt className="text-sm font-semibold text-slate-ft">{VOLUME_LABELS[key]}</dt>
                <dd className="text-xl font-bold" data-testid={`total-${key}`}>
                  {formatGallons(computed?.totals?.[key].gal)} gal
                </dd>
                <dd className="text-sm text-slate-ft">{formatGallons(computed?.totals?.[key].L)} L</dd>
              </div>
            ))}
          </dl>
          {totalsFetcher.state !== "idle" ? <p className="mt-2 text-sm text-slate-ft">Updating…</p> : null}
          {leftOut.length ? (
            <ul className="mt-2 space-y-1 text-sm font-medium" data-testid="totals-left-out">
              {leftOut.map((entry) => (
                <li key={entry.index}>
                  Discharge {entry.index + 1} is left out of these totals: {entry.because}.
                </li>
              ))}
            </ul>
          ) : null}
          <p className="mt-2 text-xs text-slate-ft">
            Estimates from the figures entered; the saved report keeps the server&apos;s computation.
          </p>
        </section>

        <section className="card space-y-4" aria-labelledby="runoff-title">
          <div className="flex flex-wrap items-center justify-between gap-2">
            <h2 id="runoff-title" className="text-lg font-semibold">
              Where the runoff went
            </h2>
            <button
              type="submit"
              className="btn-secondary"
              disabled={dispositions.length >= MAX_RUNOFF_LINES}
              {...form.insert.getButtonProps({
                name: fields.dispositions.name,
                defaultValue: NEW_DISPOSITION as never,
              })}
            >
              Add a runoff line
            </button>
          </div>
          <UsageCautions kind="runoff" />
          <p className="text-sm text-slate-ft">
            Give every line as a share of the foam solution (adding up to 100 %), or every line as a volume in gallons.
          </p>
          <ErrorList id={fields.dispositions.errorId} errors={fields.dispositions.errors} />
          <ol className="space-y-3">
            {dispositions.map((line, index) => {
              const row = line.getFieldset();
              const values = (line.value ?? {}) as Record<string, string | undefined>;
              return (
                <li
                  key={line.key}
                  className="rounded-md border border-stone-200 p-3"
                  aria-label={`Runoff line ${index + 1}`}
                >
                  <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
                    <SelectField
                      label="Went to"
                      field={row.disposition}
                      options={choices(DISPOSITIONS.map((value) => [value, DISPOSITION_LABELS[value]]))}
                    />
                    <TextField label="Share (%)" field={row.sharePercent} inputMode="decimal" />
                    <TextField label="Or volume (gal)" field={row.volumeGal} inputMode="decimal" />
                    <TextField label="Receiving water or drain" field={row.receivingWater} />
                    {values.disposition === "contained" ? (
                      <TextField
                        label="Disposal record"
                        field={row.disposalReference}
                        hint="Manifest, ticket or drum number."
                      />
                    ) : null}
                    {values.disposition === "sanitary_sewer" ? (
                      <TextField label="Treatment works told" field={row.sewerNotice} hint="Who, and when." />
                    ) : null}
                  </div>
                  <button
                    type="submit"
                    className="btn-quiet mt-2"
                    {...form.remove.getButtonProps({ name: fields.dispositions.name, index })}
                  >
                    Remove<span className="sr-only"> runoff line {index + 1}</span>
                  </button>
                </li>
              );
            })}
          </ol>
        </section>

        <section className="card space-y-4" aria-labelledby="tanks-title">
          <div className="flex flex-wrap items-center justify-between gap-2">
            <h2 id="tanks-title" className="text-lg font-semibold">
              Concentrate tanks after use
            </h2>
            <button
              type="submit"
              className="btn-secondary"
              disabled={tankReadings.length >= MAX_TANK_READINGS}
              {...form.insert.getButtonProps({ name: fields.tankReadings.name })}
            >
              Add a tank reading
            </button>
          </div>
          <p className="text-sm text-slate-ft">
            A refill amount, or the levels before and after, lets Foamtally compare the computed concentrate with the
            tank.
          </p>
          <ol className="space-y-3">
            {tankReadings.map((line, index) => {
              const row = line.getFieldset();
              return (
                <li
                  key={line.key}
                  className="grid gap-3 rounded-md border border-stone-200 p-3 sm:grid-cols-2 lg:grid-cols-5"
                  aria-label={`Tank reading ${index + 1}`}
                >
                  <SelectField
                    label="Apparatus"
                    field={row.apparatusId}
                    placeholder="Choose"
                    options={choices(props.apparatus.map((option) => [String(option.id), option.unitId]))}
                  />
                  <SelectField
                    label="Concentrate"
                    field={row.productId}
                    placeholder="Choose"
                    options={choices(props.products.map((option) => [String(option.id), option.name]))}
                  />
                  <TextField label="Refilled (gal)" field={row.refillGal} inputMode="decimal" />
                  <TextField label="Level before (gal)" field={row.levelBeforeGal} inputMode="decimal" />
                  <TextField label="Level after (gal)" field={row.levelAfterGal} inputMode="decimal" />
                  <button
                    type="submit"
                    className="btn-quiet"
                    {...form.remove.getButtonProps({ name: fields.tankReadings.name, index })}
                  >
                    Remove<span className="sr-only"> tank reading {index + 1}</span>
                  </button>
                </li>
              );
            })}
          </ol>
        </section>

        {accepted || props.reasonRequired ? (
          <section className="card" aria-labelledby="revision-title">
            <h2 id="revision-title" className="text-lg font-semibold">
              {accepted ? "Reason for this revision" : "Reason for this change"}
            </h2>
            <p className="text-sm text-slate-ft">
              {accepted
                ? "This report was accepted. Your change becomes a new revision and goes back for review."
                : "Someone else filed this report. Your reason is kept in its history with your name."}
            </p>
            <textarea
              name="revisionReason"
              id="revision-reason"
              aria-label={accepted ? "Reason for this revision" : "Reason for this change"}
              aria-invalid={form.allErrors.revisionReason ? true : undefined}
              aria-describedby={form.allErrors.revisionReason ? "revision-reason-error" : undefined}
              rows={2}
              className="field-input"
              maxLength={500}
              required
            />
            <ErrorList id="revision-reason-error" errors={form.allErrors.revisionReason} />
          </section>
        ) : null}

        <div
          ref={actionsBar}
          className="report-actions sticky bottom-0 z-10 flex flex-wrap items-center gap-3 border-t border-stone-300 bg-stone-50 py-3"
        >
          <button type="submit" name="intent" value="file" className="btn-primary" disabled={saving}>
            {accepted ? "File this revision" : "File report"}
          </button>
          {!accepted && props.status !== "filed" ? (
            <button
              type="submit"
              name="intent"
              value="save-draft"
              className="btn-secondary"
              formNoValidate
              disabled={saving}
            >
              Save draft
            </button>
          ) : null}
          {saving ? <span className="text-sm">Saving…</span> : null}
          <SaveState dirty={copy.dirty} savedAt={props.savedAt} status={props.status} timeZone={props.timeZone} />
        </div>
      </Form>
    </FormProvider>
  );
}

/** Whether what is shown is saved, and when it was, in the agency's time zone. */
function SaveState({
  dirty,
  savedAt,
  status,
  timeZone,
}: {
  dirty: boolean;
  savedAt?: string | null;
  status?: EventStatus;
  timeZone: string;
}) {
  const when = savedAt
    ? new Date(savedAt).toLocaleString("en-US", { timeZone, dateStyle: "medium", timeStyle: "short" })
    : null;
  return (
    <p className="text-sm text-slate-ft" aria-live="polite" data-testid="save-state">
      {dirty ? "Changes not saved yet; a copy is kept on this device. " : ""}
      {when && status === "draft" ? (
        <>
          Draft saved <time dateTime={savedAt!}>{when}</time> ({timeZone}).
        </>
      ) : null}
    </p>
  );
}

type DischargeLineProps = {
  name: string;
  index: number;
  listName: string;
  full: boolean;
  result?: NonNullable<TotalsResponse["discharges"]>[number];
  /** Why the line is not in the live totals, when it is not. */
  leftOutBecause?: string;
  apparatus: ApparatusOption[];
  products: ProductOption[];
  apparatusById: Map<number, ApparatusOption>;
  productsById: Map<number, ProductOption>;
};

/**
 * One discharge. Each line reads its own fields (`useField`), so the form's work grows with the
 * number of lines, not with its square.
 */
function DischargeLine({ name, index, listName, full, result, leftOutBecause, ...props }: DischargeLineProps) {
  const [line, form] = useField<z.input<typeof DischargeLineSchema>>(name);
  const row = line.getFieldset();
  const values = (line.value ?? {}) as Record<string, string | undefined>;
  const unit = props.apparatusById.get(Number(values.apparatusId));
  const product = props.productsById.get(Number(values.productId));
  const [mutualAid, setMutualAid] = useState(Boolean(values.mutualAidAgency || values.mutualAidUnit));
  const apparatusById = props.apparatusById;
  const productsById = props.productsById;
  return (
    <li className="rounded-md border border-stone-200 p-3" aria-label={`Discharge ${index + 1}`}>
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h3 className="font-semibold">Discharge {index + 1}</h3>
        <div className="flex gap-2">
          <button
            type="submit"
            className="btn-quiet"
            disabled={full}
            {...form.insert.getButtonProps({
              name: listName,
              index: index + 1,
              defaultValue: values as never,
            })}
          >
            Duplicate<span className="sr-only"> discharge {index + 1}</span>
          </button>
          <button type="submit" className="btn-quiet" {...form.remove.getButtonProps({ name: listName, index })}>
            Remove<span className="sr-only"> discharge {index + 1}</span>
          </button>
        </div>
      </div>
      <MutualAidSwitch
        id={`${row.mutualAidAgency.id}-switch`}
        checked={mutualAid}
        onChange={(checked) => {
          setMutualAid(checked);
          if (checked) form.update({ name: row.apparatusId.name, value: "" });
          else {
            form.update({ name: row.mutualAidAgency.name, value: "" });
            form.update({ name: row.mutualAidUnit.name, value: "" });
          }
        }}
      />
      <div className="mt-2 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
        {mutualAid ? (
          <MutualAidFields agency={row.mutualAidAgency} unit={row.mutualAidUnit} />
        ) : (
          <SelectField
            label="Apparatus"
            field={row.apparatusId}
            placeholder="Not listed"
            options={choices(
              props.apparatus.map((option) => [String(option.id), `${option.unitId} ${option.description}`]),
            )}
            onChange={(event) => {
              const chosen = apparatusById.get(Number(event.currentTarget.value));
              const outlet = chosen?.outlets.find((item) => item.foamCapable) ?? chosen?.outlets[0];
              if (outlet && !values.outlet) {
                form.update({ name: row.outlet.name, value: outlet.name });
                if (outlet.defaultFlowGpm && !values.flow)
                  form.update({ name: row.flow.name, value: String(outlet.defaultFlowGpm) });
                form.update({ name: row.basis.name, value: outlet.defaultFlowBasis });
                if (outlet.defaultMethod) form.update({ name: row.method.name, value: outlet.defaultMethod });
              }
            }}
          />
        )}
        <div>
          <label htmlFor={row.outlet.id} className="field-label">
            Outlet
          </label>
          <input
            {...getInputProps(row.outlet, { type: "text" })}
            key={row.outlet.key}
            list={unit ? `outlets-${unit.id}` : undefined}
            className="field-input"
          />
          {unit ? (
            <datalist id={`outlets-${unit.id}`}>
              {unit.outlets.map((outlet) => (
                <option key={outlet.name} value={outlet.name} />
              ))}
            </datalist>
          ) : null}
          <FoamSystemNote unit={unit} outlet={values.outlet} />
          <ErrorList id={row.outlet.errorId} errors={row.outlet.errors} />
        </div>
        <SelectField
          label="Concentrate"
          field={row.productId}
          placeholder={WATER_ONLY_LABEL}
          options={choices(
            props.products.map((option) => [
              String(option.id),
              `${option.name} (${FOAM_CLASS_LABELS[option.foamClass]}${option.pfasContaining ? ", contains PFAS" : ""}${option.heldForDisposal ? ", held for disposal" : ""})`,
            ]),
          )}
          onChange={(event) => {
            const chosen = productsById.get(Number(event.currentTarget.value));
            if (!chosen || values.percent) return;
            const compressedAir = values.method === "compressed_air" || (unit?.compressedAirCfm ?? 0) > 0;
            // About 0.3 % is the usual compressed-air Class A ratio (common practice, no source).
            const suggested = chosen.foamClass === "A" && compressedAir ? 0.3 : chosen.nominalPercents[0];
            if (suggested) form.update({ name: row.percent.name, value: String(suggested) });
          }}
        />
        <TextField
          label="Percent"
          field={row.percent}
          inputMode="decimal"
          hint={product ? `Nominal ${product.nominalPercents.join(" or ") || "—"} %` : "Blank for water only."}
        />
        <SelectField
          label="Share of (solution or water)"
          field={row.percentOf}
          placeholder={`As the proportioner sets it: ${PERCENT_OF_LABELS[defaultPercentOf(values.basis === "solution" ? "solution" : "water", unit?.proportionerType)]}`}
          options={choices(PERCENT_OF.map((option) => [option, PERCENT_OF_LABELS[option]]))}
        />
        <TextField label="Flow" field={row.flow} inputMode="decimal" />
        <SelectField
          label="Flow unit"
          field={row.flowUnit}
          options={choices(FLOW_UNITS.map((unit) => [unit, FLOW_UNIT_LABELS[unit]]))}
        />
        <SelectField label="Flow is" field={row.basis} options={choices(Object.entries(FLOW_BASIS_LABELS))} />
        <SelectField
          label="Method"
          field={row.method}
          placeholder="Choose"
          options={choices(APPLICATION_METHODS.map((method) => [method, APPLICATION_METHOD_LABELS[method]]))}
        />
        <TextField label="Minutes" field={row.minutes} inputMode="decimal" hint="Or give start and end." />
        <TextField label="Start" field={row.startedAt} type="datetime-local" />
        <TextField label="End" field={row.endedAt} type="datetime-local" />
        {values.method === "compressed_air" ? (
          <TextField label="Air flow (cfm)" field={row.airFlowCfm} inputMode="decimal" />
        ) : null}
        {product?.heldForDisposal || values.heldUseReason ? (
          <div className="sm:col-span-2 lg:col-span-4">
            <TextField
              label="Why foam held for disposal was used"
              field={row.heldUseReason}
              autoComplete="off"
              hint="This product is held for disposal (legacy PFAS foam). Choose another, or say why it was used; the reason is kept with the report."
            />
          </div>
        ) : null}
      </div>
      {leftOutBecause ? (
        <p className="mt-2 text-sm font-medium text-slate-ft">Not in the totals yet: {leftOutBecause}.</p>
      ) : (
        <LineResult result={result} />
      )}
    </li>
  );
}

function choices(pairs: Array<[string, string]>) {
  return pairs.map(([value, label]) => ({ value, label }));
}

function FoamSystemNote({ unit, outlet }: { unit?: ApparatusOption; outlet?: string }) {
  const system = systemForOutlet(unit, outlet);
  if (!system) return null;
  return (
    <p className="mt-1 text-sm text-slate-ft" data-testid="line-foam-system">
      Foam system: {system.name}
      {system.outOfTolerance ? " (out of tolerance)" : ""}
    </p>
  );
}

function LineResult({ result }: { result?: NonNullable<TotalsResponse["discharges"]>[number] }) {
  if (!result) return null;
  return (
    <div className="mt-2 text-sm" data-testid="line-result">
      <p className="text-slate-ft">
        Water {formatGallons(result.water.gal)} gal · concentrate {formatGallons(result.concentrate.gal)} gal · solution{" "}
        {formatGallons(result.solution.gal)} gal
        {result.effectivePercentOfSolution != null
          ? ` · ${Number(result.effectivePercentOfSolution.toFixed(3))} % of the foam solution`
          : ""}
      </p>
      {result.warnings.length ? (
        <ul className="mt-1 space-y-1" aria-label="Warnings for this discharge">
          {result.warnings.map((warning) => (
            <li key={warning.code} className="caution" role="note">
              {warning.message}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

/**
 * The photos whose recorded position was kept: each offers its position for the event, which fills
 * the latitude and longitude fields (and moves the marker); nothing is saved until the form is.
 */
function PhotoPositions({
  photos,
  onUse,
}: {
  photos: PhotoPositionOption[];
  onUse: (point: { latitude: number; longitude: number }) => void;
}) {
  const [used, setUsed] = useState<number | null>(null);
  return (
    <div className="rounded border border-slate-300 p-3 text-sm" data-testid="photo-positions">
      <p className="font-semibold">Positions recorded by attached photos</p>
      <ul className="mt-1 space-y-1">
        {photos.map((photo) => (
          <li key={photo.id} className="flex flex-wrap items-center gap-2">
            <span>
              {photo.name}: {photo.latitude}, {photo.longitude}
            </span>
            <button
              type="button"
              className="btn-secondary"
              aria-label={`Use the position of ${photo.name} for the event`}
              onClick={() => {
                // A new object each time, so the same photo can be asked for again after a change.
                onUse({ latitude: photo.latitude, longitude: photo.longitude });
                setUsed(photo.id);
              }}
            >
              Use this photo&apos;s position for the event
            </button>
            {used === photo.id ? (
              <span role="status">Placed in the latitude and longitude fields; save the report to keep it.</span>
            ) : null}
          </li>
        ))}
      </ul>
      <p className="mt-1 text-slate-ft">
        A phone records where it was, not always where the foam went: check the marker before saving.
      </p>
    </div>
  );
}
