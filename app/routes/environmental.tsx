import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/environmental";
import { requireCapability } from "~/lib/access.server";
import { roundForDisplay } from "~/lib/foam/units";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress } from "~/lib/http.server";
import { lastCompleteQuarter, parseReportPeriod, periodQuery, type ReportPeriod } from "~/lib/reporting/period";
import { localDateTime } from "~/lib/time-zone";
import { can } from "~/lib/access";
import { flashHeaders } from "~/lib/session.server";
import { COUNTED_REPORTS, FOAM_CLASS_LABELS, RQ_ANSWER_LABELS } from "~/lib/foam/vocabulary";
import { readAgencySettings } from "~/models/agency-settings.server";
import { eventsChangedSince, periodAggregates, pfasRows } from "~/models/environmental-report.server";
import { latestSubmissionFor, listSubmissions } from "~/models/quarterly-submission.server";
import { heaviestWindowPounds } from "~/exports/environmental-common.server";
import { sendQuarterWorkbook, submitQuarter } from "~/exports/environmental-delivery.server";

export const meta: Route.MetaFunction = () => [{ title: "Quarterly runoff and PFAS summary · Foamtally" }];

const PERIOD_FIELDS = ["year", "quarter", "from", "to"];

function periodParams(source: URLSearchParams | FormData): URLSearchParams {
  const params = new URLSearchParams();
  for (const key of PERIOD_FIELDS) {
    const value = source.get(key);
    if (typeof value === "string" && value.trim() !== "") params.set(key, value.trim());
  }
  return params;
}

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "exports.quarterly");
  const agency = await readAgencySettings();
  const asked = periodParams(new URL(request.url).searchParams);
  const parsed = parseReportPeriod(
    asked.size > 0 ? asked : lastCompleteQuarter(new Date(), agency.timeZone),
    agency.timeZone,
  );
  const periodError = parsed.ok ? null : parsed.message;
  const period = parsed.ok
    ? parsed.period
    : (
        parseReportPeriod(lastCompleteQuarter(new Date(), agency.timeZone), agency.timeZone) as {
          ok: true;
          period: ReportPeriod;
        }
      ).period;
  const [aggregates, pfas, submission, history] = await Promise.all([
    periodAggregates(period),
    pfasRows(period, agency.pfasReportableLb),
    latestSubmissionFor(period),
    listSubmissions(),
  ]);
  const changes = submission ? await eventsChangedSince(period, submission.submittedAt) : [];
  const concentrateBy = (foamClass: string) =>
    aggregates.byClass.filter((row) => row.foamClass === foamClass).reduce((total, row) => total + row.concentrate, 0);
  const heaviest = heaviestWindowPounds(pfas);
  return data(
    {
      periodError,
      period: { from: period.from, to: period.to, label: period.label, year: period.year, quarter: period.quarter },
      query: periodQuery(period),
      agency: {
        name: agency.name,
        timeZone: agency.timeZone,
        reportRecipients: agency.reportRecipients,
        thresholdLb: agency.pfasReportableLb,
      },
      figures: {
        accepted: aggregates.eventCount,
        awaitingReview: aggregates.awaitingReview,
        returned: aggregates.returned,
        discharges: aggregates.dischargeCount,
        classAConcentrate: concentrateBy(FOAM_CLASS_LABELS.A),
        classBConcentrate: concentrateBy(FOAM_CLASS_LABELS.B),
        solution: aggregates.eventTotals.solution,
        stormDrain: aggregates.byDisposition.storm_drain,
        surfaceWater: aggregates.byDisposition.surface_water,
        pfasEvents: new Set(pfas.map((row) => row.eventId)).size,
        pfasHeaviestLb: heaviest,
        pfasUnknown: pfas.some((row) => row.thresholdReached === "Unknown"),
        pfasReached: pfas.some((row) => row.thresholdReached === "Yes"),
      },
      submission: submission && {
        id: submission.id,
        submittedAt: localDateTime(submission.submittedAt, agency.timeZone),
        submittedBy: submission.submittedBy,
        sha256: submission.sha256,
        changes: changes.map((change) => ({ ...change, changedAt: localDateTime(change.changedAt, agency.timeZone) })),
      },
      history: history.map((row) => ({ ...row, submittedAt: localDateTime(row.submittedAt, agency.timeZone) })),
      canSubmit: can(user, "exports.submit"),
    },
    { status: periodError ? 400 : 200 },
  );
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireCapability(request, "exports.submit");
  const formData = await readFormData(request, [], { fields: ["intent", "note", ...PERIOD_FIELDS] });
  const intent = formData.get("intent");
  const agency = await readAgencySettings();
  const parsed = parseReportPeriod(periodParams(formData), agency.timeZone);
  if (!parsed.ok) return data({ error: parsed.message }, { status: 400 });
  const period = parsed.period;
  const back = `/environmental?${periodQuery(period)}`;
  const actor = { user, clientAddress: clientAddress(request) };
  if (intent === "submit") {
    const already = await latestSubmissionFor(period);
    if (already) {
      return data(
        {
          error: `${period.label} was already marked submitted on ${localDateTime(already.submittedAt, agency.timeZone)} by ${already.submittedBy}. Changes since are listed under “Changed since submission”; the submitted file stays as it was.`,
        },
        { status: 409 },
      );
    }
    const note =
      String(formData.get("note") ?? "")
        .trim()
        .slice(0, 2000) || null;
    const file = await submitQuarter(period, note, actor);
    throw redirect(back, {
      headers: await flashHeaders(
        request,
        `${period.label} marked submitted. SHA-256 of the stored file: ${file.sha256}.`,
      ),
    });
  }
  if (intent === "send") {
    const sent = await sendQuarterWorkbook(period, actor);
    if (!sent.ok) {
      return data(
        { error: "No report recipients are set. An administrator sets them in the agency settings." },
        { status: 400 },
      );
    }
    throw redirect(back, {
      headers: await flashHeaders(
        request,
        `The ${period.label} workbook is queued for ${agency.reportRecipients.join(", ")}. A failed send is retried automatically.`,
      ),
    });
  }
  return data({ error: "Unknown request." }, { status: 400 });
}

const galText = (value: number) => `${roundForDisplay(value, 2).toLocaleString("en-US")} US gal`;

export default function Environmental({ loaderData, actionData }: Route.ComponentProps) {
  const { period, figures, submission, agency } = loaderData;
  const navigation = useNavigation();
  const busy = navigation.state !== "idle";
  const thisYear = new Date().getUTCFullYear();
  const years = Array.from({ length: 6 }, (_, index) => thisYear - index);
  const hidden = (
    <>
      {period.year !== null ? <input type="hidden" name="year" value={period.year} /> : null}
      {period.quarter !== null ? <input type="hidden" name="quarter" value={period.quarter} /> : null}
      {period.year === null ? (
        <>
          <input type="hidden" name="from" value={period.from} />
          <input type="hidden" name="to" value={period.to} />
        </>
      ) : null}
    </>
  );
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">Quarterly runoff and PFAS summary</h1>
      {loaderData.periodError ? (
        <p role="alert" className="field-error">
          {loaderData.periodError} Showing {period.label} instead.
        </p>
      ) : null}
      {actionData && "error" in actionData ? (
        <p role="alert" className="field-error">
          {actionData.error}
        </p>
      ) : null}

      <section className="card" aria-labelledby="period-title">
        <h2 id="period-title" className="text-lg font-semibold">
          Period
        </h2>
        <div className="mt-3 flex flex-wrap items-end gap-6">
          <Form method="get" className="flex flex-wrap items-end gap-3">
            <div>
              <label htmlFor="year" className="field-label">
                Year
              </label>
              <select id="year" name="year" defaultValue={period.year ?? thisYear} className="field-input">
                {years.map((year) => (
                  <option key={year} value={year}>
                    {year}
                  </option>
                ))}
              </select>
            </div>
            <div>
              <label htmlFor="quarter" className="field-label">
                Quarter
              </label>
              <select id="quarter" name="quarter" defaultValue={period.quarter ?? 1} className="field-input">
                {[1, 2, 3, 4].map((quarter) => (
                  <option key={quarter} value={quarter}>
                    Q{quarter}
                  </option>
                ))}
              </select>
            </div>
            <button type="submit" className="btn-secondary">
              Show quarter
            </button>
          </Form>
          <Form method="get" className="flex flex-wrap items-end gap-3">
            <div>
              <label htmlFor="from" className="field-label">
                From (first day)
              </label>
              <input
                id="from"
                name="from"
                type="date"
                defaultValue={period.year === null ? period.from : ""}
                className="field-input"
              />
            </div>
            <div>
              <label htmlFor="to" className="field-label">
                To (last day)
              </label>
              <input
                id="to"
                name="to"
                type="date"
                defaultValue={period.year === null ? period.to : ""}
                className="field-input"
              />
            </div>
            <button type="submit" className="btn-secondary">
              Show dates
            </button>
          </Form>
        </div>
      </section>

      <section className="card space-y-4" aria-labelledby="figures-title">
        <h2 id="figures-title" className="text-lg font-semibold">
          {period.label}{" "}
          <span className="font-normal text-slate-ft">
            ({period.from} to {period.to}, {agency.timeZone})
          </span>
        </h2>
        <p className="text-sm text-slate-ft" data-testid="quarter-counted">
          Reports counted in the totals below: {COUNTED_REPORTS.accepted}.
        </p>
        <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-2 lg:grid-cols-3">
          <Figure label="Accepted reports counted" value={String(figures.accepted)} />
          <Figure label="Filed, awaiting review (not counted)" value={String(figures.awaitingReview)} />
          <Figure label="Returned to officers (not counted)" value={String(figures.returned)} />
          <Figure label="Class A concentrate" value={galText(figures.classAConcentrate)} />
          <Figure label="Class B concentrate" value={galText(figures.classBConcentrate)} />
          <Figure label="Foam solution" value={galText(figures.solution)} />
          <Figure label="To storm drains" value={galText(figures.stormDrain)} />
          <Figure label="To surface water" value={galText(figures.surfaceWater)} />
          <Figure
            label="PFOA or PFOS: heaviest 24 hours"
            value={`${roundForDisplay(figures.pfasHeaviestLb, 3)} lb of ${agency.thresholdLb} lb threshold (${figures.pfasEvents} ${figures.pfasEvents === 1 ? "event" : "events"})`}
          />
          <Figure
            label="Reportable quantity reached"
            value={figures.pfasReached ? "Yes" : figures.pfasUnknown ? RQ_ANSWER_LABELS.unknown : "No"}
          />
        </dl>
        {figures.accepted === 0 ? <p>No accepted reports fall in this period; the workbook will say so.</p> : null}
        {figures.pfasReached ? (
          <p className="caution" role="note">
            The estimated PFOA or PFOS reaching a surface reaches the {agency.thresholdLb} lb threshold within 24 hours.
            The default is the CERCLA reportable quantity for PFOA and for PFOS (40 CFR 302.4); notice is due
            immediately once known (CERCLA §103, EPCRA §304), and state law may add its own. This page is not that
            notice.
          </p>
        ) : null}
        {figures.pfasUnknown ? (
          <p className="caution" role="note">
            Some PFAS-containing products have no PFOA or PFOS content in the catalogue: whether the reportable quantity
            was reached is unknown, not &ldquo;no&rdquo; (mixture rule, 40 CFR 302.6(b)(1)(ii)).
          </p>
        ) : null}
        <p className="caution">
          These figures are estimates from officers&apos; reports. Local codes, permits and state and federal reporting
          law govern what must be reported, when and to whom.
        </p>
        <div className="flex flex-wrap gap-3">
          <a className="btn-primary" href={`/reports/environmental.xlsx?${loaderData.query}`} download>
            Download workbook (XLSX)
          </a>
          <a className="btn-secondary" href={`/reports/environmental.csv?${loaderData.query}`} download>
            Download tables (CSV, zipped)
          </a>
        </div>
      </section>

      <section className="card space-y-4" aria-labelledby="submit-title">
        <h2 id="submit-title" className="text-lg font-semibold">
          Submission
        </h2>
        {submission ? (
          <div className="space-y-2">
            <p>
              Marked submitted on {submission.submittedAt} by {submission.submittedBy}.{" "}
              <a className="font-medium text-pond-700 underline" href={`/environmental/submissions/${submission.id}`}>
                Download the submitted file
              </a>
            </p>
            <p className="text-sm break-all text-slate-ft">SHA-256 {submission.sha256}</p>
            {submission.changes.length > 0 ? (
              <div className="caution">
                <p className="font-semibold">Changed since submission:</p>
                <ul className="list-disc pl-5">
                  {submission.changes.map((change) => (
                    <li key={`${change.number}-${change.revision}-${change.changedAt}`}>
                      <span className="event-number">{change.number}</span> (revision {change.revision},{" "}
                      {change.changedAt}): {change.reason}
                    </li>
                  ))}
                </ul>
              </div>
            ) : (
              <p>No event of this period has changed since.</p>
            )}
          </div>
        ) : (
          <p>This period has not been marked submitted.</p>
        )}
        {loaderData.canSubmit ? (
          <div className="flex flex-wrap gap-6">
            <Form method="post" className="space-y-2">
              {hidden}
              <input type="hidden" name="intent" value="submit" />
              <label htmlFor="note" className="field-label">
                Note (optional, e.g. where it was sent)
              </label>
              <input
                id="note"
                name="note"
                maxLength={2000}
                className="field-input"
                disabled={submission !== null}
                aria-describedby="submit-hint"
              />
              <button type="submit" className="btn-primary" disabled={busy || submission !== null}>
                Mark {period.label} submitted
              </button>
              <p id="submit-hint" className="text-xs text-slate-ft">
                {submission
                  ? `${period.label} is already marked submitted; its stored file stays as it was.`
                  : "Stores this exact workbook with its SHA-256 digest, your name and the time."}
              </p>
            </Form>
            <Form method="post" className="space-y-2">
              {hidden}
              <input type="hidden" name="intent" value="send" />
              <p className="text-sm">
                Recipients: {agency.reportRecipients.length > 0 ? agency.reportRecipients.join(", ") : "none set"}
              </p>
              <button type="submit" className="btn-secondary" disabled={busy || agency.reportRecipients.length === 0}>
                E-mail the workbook to the recipients
              </button>
              <p className="text-xs text-slate-ft">Sends the submitted file if there is one, else a fresh copy.</p>
            </Form>
          </div>
        ) : null}
      </section>

      <section className="card overflow-x-auto" aria-labelledby="history-title">
        <h2 id="history-title" className="text-lg font-semibold">
          Submissions
        </h2>
        {loaderData.history.length === 0 ? (
          <p className="mt-2">No period has been marked submitted yet.</p>
        ) : (
          <table className="data-table mt-3">
            <thead>
              <tr>
                <th scope="col">Period</th>
                <th scope="col">Submitted</th>
                <th scope="col">By</th>
                <th scope="col">Reports</th>
                <th scope="col">File and SHA-256</th>
              </tr>
            </thead>
            <tbody>
              {loaderData.history.map((row) => (
                <tr key={row.id}>
                  <td>
                    <Link
                      className="text-pond-700 underline"
                      to={`/environmental?${periodQuery({
                        from: row.periodFrom,
                        to: row.periodTo,
                        year: /^\d{4} Q[1-4]$/.test(row.label) ? Number(row.label.slice(0, 4)) : null,
                        quarter: /^\d{4} Q[1-4]$/.test(row.label) ? Number(row.label.slice(6)) : null,
                      })}`}
                    >
                      {row.label}
                    </Link>
                  </td>
                  <td>{row.submittedAt}</td>
                  <td>{row.submittedBy}</td>
                  <td>{row.acceptedReports}</td>
                  <td className="break-all">
                    <a className="text-pond-700 underline" href={`/environmental/submissions/${row.id}`}>
                      {row.fileName}
                    </a>
                    <span className="block text-xs text-slate-ft">{row.sha256}</span>
                    {row.note ? <span className="block text-xs">{row.note}</span> : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </div>
  );
}

function Figure({ label, value }: { label: string; value: string }) {
  return (
    <div>
      <dt className="text-sm text-slate-ft">{label}</dt>
      <dd className="font-semibold">{value}</dd>
    </div>
  );
}
