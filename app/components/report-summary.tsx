import {
  APPLICATION_METHOD_LABELS,
  dischargeUnitLabel,
  DISPOSITION_LABELS,
  incidentTypeLabel,
  MUTUAL_AID_LABEL,
  EVENT_KIND_LABELS,
  FLOW_BASIS_LABELS,
  FLOW_UNIT_LABELS,
  foamClassLabel,
  HELD_FOR_DISPOSAL_LABEL,
  VOLUME_LABELS,
  VOLUMES,
  WATER_ONLY_LABEL,
  type Disposition,
  type EventKind,
  PERCENT_OF_LABELS,
  type PercentOf,
  UNACCOUNTED_LABEL,
} from "~/lib/foam/vocabulary";
import type { UsageWarning } from "~/lib/foam/totals";
import type { GeographyChecks } from "~/lib/geo/checks";
import { gallonsToLitres } from "~/lib/foam/units";
import { UsageCautions } from "./usage-cautions";

type Line = {
  position: number;
  apparatus: string | null;
  mutualAidAgency?: string | null;
  mutualAidUnit?: string | null;
  outlet: string;
  product: string | null;
  foamClass: "A" | "B" | null;
  pfasContaining: boolean;
  percent: number | null;
  effectivePercent: number | null;
  percentOf?: PercentOf;
  effectivePercentOfSolution?: number | null;
  flow: number;
  flowUnit: "gpm" | "lpm";
  basis: "water" | "solution";
  minutes: number;
  method: string | null;
  /** Why a product held for disposal was used all the same. */
  heldUseReason?: string | null;
  water: number;
  concentrate: number;
  solution: number;
  warnings: UsageWarning[];
};

export type SummaryReport = {
  kind: EventKind;
  incidentType?: string | null;
  dispatchNumber?: string | null;
  timeZone: string;
  startedAt: string;
  clearedAt: string;
  address: string;
  latitude: number | null;
  longitude: number | null;
  station: string | null;
  narrative: string;
  authorName: string | null;
  pfasContaining: boolean;
  eventWarnings: UsageWarning[];
  totals: { water: number; concentrate: number; solution: number };
  /** Concentrate × the products' unit costs (US $), where the catalogue has them. */
  concentrateCostUsd?: number | null;
  geography: GeographyChecks;
  discharges: Line[];
  dispositions: Array<{
    disposition: Disposition;
    sharePercent: number | null;
    volumeGal: number | null;
    releasedGal: number;
    receivingWater: string;
    disposalReference: string;
    sewerNotice: string;
  }>;
  /** Foam solution no runoff line accounts for (`unaccountedGallons`); 0 when they add up. */
  unaccountedGal: number;
  /** Each tank's drawdown beside the concentrate computed for it (absent on older snapshots). */
  drawdowns?: Array<{
    apparatus: string | null;
    product: string | null;
    computedGal: number;
    drawdownGal: number;
    drawdownExceeds: boolean;
    pfasContaining: boolean;
  }>;
  tankReadings: Array<{
    apparatus: string | null;
    product: string | null;
    refillGal: number | null;
    levelBeforeGal: number | null;
    levelAfterGal: number | null;
  }>;
};

const gal = (value: number, digits = 2) => value.toLocaleString("en-US", { maximumFractionDigits: digits });
const when = (value: string) => (value ? value.replace("T", " ") : "—");

export function ReportSummary({ report }: { report: SummaryReport }) {
  const { geography } = report;
  return (
    <>
      <section className="card" aria-labelledby="summary-title">
        <h2 id="summary-title" className="text-lg font-semibold">
          Event
        </h2>
        <dl className="mt-3 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
          <Item label="Kind" value={EVENT_KIND_LABELS[report.kind]} />
          <Item label="Incident type" value={incidentTypeLabel(report.incidentType)} />
          <Item label="Dispatch (CAD) number" value={report.dispatchNumber || "—"} />
          <Item label="Station" value={report.station ?? "—"} />
          <Item label={`Started (${report.timeZone})`} value={when(report.startedAt)} />
          <Item label={`Cleared (${report.timeZone})`} value={when(report.clearedAt)} />
          <Item label="Address" value={report.address || "—"} />
          <Item
            label="Location"
            value={
              report.latitude != null && report.longitude != null
                ? `${report.latitude.toFixed(5)}, ${report.longitude.toFixed(5)}`
                : "—"
            }
          />
          <Item label="Filed by" value={report.authorName ?? "—"} />
        </dl>
        {report.narrative ? <p className="mt-3 whitespace-pre-line">{report.narrative}</p> : null}
      </section>

      <section className="card" aria-labelledby="totals-heading">
        <h2 id="totals-heading" className="text-lg font-semibold">
          Totals
        </h2>
        <dl className="mt-3 grid grid-cols-3 gap-4" data-testid="saved-totals">
          {VOLUMES.map((key) => (
            <div key={key} className="rounded-md bg-stone-100 p-3">
              <dt className="text-sm font-semibold text-slate-ft">{VOLUME_LABELS[key]}</dt>
              <dd className="text-xl font-bold">{gal(report.totals[key])} gal</dd>
              <dd className="text-sm text-slate-ft">{gal(gallonsToLitres(report.totals[key]))} L</dd>
            </div>
          ))}
        </dl>
        {report.concentrateCostUsd != null ? (
          <p className="mt-3 text-sm" data-testid="concentrate-cost">
            Concentrate cost: US $
            {report.concentrateCostUsd.toLocaleString("en-US", { minimumFractionDigits: 2, maximumFractionDigits: 2 })}{" "}
            at the catalogue&apos;s current unit costs — a basis for cost recovery, not an invoice.
          </p>
        ) : null}
        {report.eventWarnings.map((warning) => (
          <p key={warning.code} className="caution mt-3" role="note">
            {warning.message}
          </p>
        ))}
        {report.pfasContaining ? (
          <div className="mt-3">
            <UsageCautions kind="pfas" />
          </div>
        ) : null}
      </section>

      <section className="card" aria-labelledby="geo-heading">
        <h2 id="geo-heading" className="text-lg font-semibold">
          Drainage and water
        </h2>
        {geography.drainageBasin || geography.nearestWaterway ? (
          <dl className="mt-3 grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
            <Item label="Drainage basin" value={geography.drainageBasin ?? "outside the mapped basins"} />
            <Item
              label="Nearest waterway"
              value={
                geography.nearestWaterway
                  ? `${geography.nearestWaterway}, ${gal(geography.nearestWaterwayM ?? 0, 0)} m`
                  : "—"
              }
            />
            <Item
              label="Nearest storm inlet"
              value={
                geography.nearestInlet ? `${geography.nearestInlet}, ${gal(geography.nearestInletM ?? 0, 0)} m` : "—"
              }
            />
            <Item
              label="Waterway buffer"
              value={
                geography.withinWaterwayBuffer == null
                  ? "—"
                  : geography.withinWaterwayBuffer
                    ? "Inside the buffer"
                    : "Outside the buffer"
              }
            />
            {geography.outsideJurisdiction ? <Item label="Jurisdiction" value="Outside the district" /> : null}
          </dl>
        ) : (
          <p className="mt-2 text-sm text-slate-ft">
            No drainage checks yet: they run once the event has a location and the layers are loaded.
          </p>
        )}
      </section>

      <section className="card overflow-x-auto" aria-labelledby="lines-heading">
        <h2 id="lines-heading" className="text-lg font-semibold">
          Discharges
        </h2>
        <table className="data-table mt-3">
          <thead>
            <tr>
              <th scope="col">#</th>
              <th scope="col">Apparatus / outlet</th>
              <th scope="col">Concentrate</th>
              <th scope="col">Percent</th>
              <th scope="col">Flow</th>
              <th scope="col">Minutes</th>
              <th scope="col">Water (gal)</th>
              <th scope="col">Concentrate (gal)</th>
              <th scope="col">Solution (gal)</th>
            </tr>
          </thead>
          <tbody>
            {report.discharges.map((line) => (
              <tr key={line.position}>
                <td>{line.position}</td>
                <td>
                  {dischargeUnitLabel(line) ?? "—"}
                  {line.outlet ? ` · ${line.outlet}` : ""}
                  {line.mutualAidAgency ? (
                    <span className="block text-xs text-slate-ft">
                      {MUTUAL_AID_LABEL}: another agency&apos;s foam system, so no capacity checks.
                    </span>
                  ) : null}
                  {line.method ? (
                    <span className="block text-xs text-slate-ft">
                      {APPLICATION_METHOD_LABELS[line.method as keyof typeof APPLICATION_METHOD_LABELS]}
                    </span>
                  ) : null}
                </td>
                <td>
                  {line.product ? `${line.product} (${foamClassLabel(line.foamClass)})` : WATER_ONLY_LABEL}
                  {line.pfasContaining ? (
                    <span className="ml-1 rounded bg-danger-50 px-1 text-xs font-bold text-danger-700">PFAS</span>
                  ) : null}
                  {line.heldUseReason ? (
                    <span className="block text-xs">
                      {HELD_FOR_DISPOSAL_LABEL}; used because: {line.heldUseReason}
                    </span>
                  ) : null}
                </td>
                <td>
                  {line.percent != null ? `${line.percent} ${PERCENT_OF_LABELS[line.percentOf ?? "water"]}` : "—"}
                  {line.effectivePercentOfSolution != null &&
                  line.percent != null &&
                  (line.percentOf === "water" || Math.abs(line.effectivePercentOfSolution - line.percent) > 1e-6) ? (
                    <span className="block text-xs text-slate-ft">
                      achieved ≈ {Number(line.effectivePercentOfSolution.toFixed(3))} % of the foam solution
                    </span>
                  ) : null}
                </td>
                <td>
                  {gal(line.flow)} {FLOW_UNIT_LABELS[line.flowUnit]}
                  <span className="block text-xs text-slate-ft">{FLOW_BASIS_LABELS[line.basis]}</span>
                </td>
                <td>{gal(line.minutes)}</td>
                <td>{gal(line.water)}</td>
                <td>{gal(line.concentrate, 3)}</td>
                <td>
                  {gal(line.solution)}
                  {line.warnings.map((warning) => (
                    <span key={warning.code} className="caution mt-1 block" role="note">
                      {warning.message}
                    </span>
                  ))}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>

      <section className="card overflow-x-auto" aria-labelledby="runoff-heading">
        <h2 id="runoff-heading" className="text-lg font-semibold">
          Where the runoff went
        </h2>
        <table className="data-table mt-3">
          <thead>
            <tr>
              <th scope="col">Went to</th>
              <th scope="col">Share or volume</th>
              <th scope="col">Released (gal of solution)</th>
              <th scope="col">Receiving water</th>
              <th scope="col">Disposal or notice</th>
            </tr>
          </thead>
          <tbody>
            {report.dispositions.map((line, index) => (
              <tr key={index}>
                <td>{DISPOSITION_LABELS[line.disposition]}</td>
                <td>{line.sharePercent != null ? `${line.sharePercent} %` : `${gal(line.volumeGal ?? 0)} gal`}</td>
                <td>{gal(line.releasedGal)}</td>
                <td>{line.receivingWater || "—"}</td>
                <td>{line.disposalReference || line.sewerNotice || "—"}</td>
              </tr>
            ))}
            {report.unaccountedGal > 0 ? (
              <tr>
                <td>{UNACCOUNTED_LABEL}</td>
                <td>—</td>
                <td>{gal(report.unaccountedGal)}</td>
                <td colSpan={2}>Counted as not contained in the PFAS figures.</td>
              </tr>
            ) : null}
          </tbody>
        </table>
        {report.tankReadings.length ? (
          <>
            <h3 className="mt-4 font-semibold">Tank readings</h3>
            <ul className="mt-1 text-sm">
              {report.tankReadings.map((line, index) => (
                <li key={index}>
                  {line.apparatus ?? "—"} · {line.product ?? "—"}:{" "}
                  {line.refillGal != null
                    ? `refilled ${gal(line.refillGal)} gal`
                    : `${gal(line.levelBeforeGal ?? 0)} → ${gal(line.levelAfterGal ?? 0)} gal`}
                </li>
              ))}
            </ul>
            <DrawdownTable drawdowns={report.drawdowns ?? []} />
          </>
        ) : null}
      </section>
    </>
  );
}

function Item({ label, value }: { label: string; value: string }) {
  return (
    <div>
      <dt className="text-sm font-semibold text-slate-ft">{label}</dt>
      <dd>{value}</dd>
    </div>
  );
}

function DrawdownTable({ drawdowns }: { drawdowns: NonNullable<SummaryReport["drawdowns"]> }) {
  if (drawdowns.length === 0) return null;
  return (
    <table className="data-table mt-3" data-testid="drawdowns">
      <caption className="text-left text-sm font-semibold">Tank drawdown beside computed concentrate</caption>
      <thead>
        <tr>
          <th scope="col">Apparatus · concentrate</th>
          <th scope="col">Computed concentrate (gal)</th>
          <th scope="col">Tank drawdown (gal)</th>
          <th scope="col">Figure for PFAS estimates</th>
        </tr>
      </thead>
      <tbody>
        {drawdowns.map((line, index) => (
          <tr key={index}>
            <td>
              {line.apparatus ?? "any apparatus"} · {line.product ?? "any concentrate"}
            </td>
            <td>{gal(line.computedGal)}</td>
            <td>{gal(line.drawdownGal)}</td>
            <td>
              {line.drawdownExceeds
                ? line.pfasContaining
                  ? "Tank drawdown: larger than computed, counted as the conservative figure"
                  : "Tank drawdown is larger than computed"
                : "Computed"}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
