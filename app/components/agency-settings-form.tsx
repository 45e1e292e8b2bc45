import {
  getFormProps,
  getInputProps,
  getSelectProps,
  getTextareaProps,
  useForm,
  type FieldMetadata,
  type SubmissionResult,
} from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { Form, useNavigation } from "react-router";
import {
  AgencySettingsSchema,
  DISPLAY_UNIT_LABELS,
  DISPLAY_UNITS,
  feetFromMetres,
  MAX_CLOSURE_DAYS,
  MAX_RECIPIENTS,
  WATERWAY_BUFFER_BASIS,
  type AgencySettings,
} from "~/lib/agency-settings-form";
import { DUE_RULE_KEYS, isDueRuleKey, RECORDS_DUE_RULES } from "~/lib/records/due-rules";
import { ErrorList, FormErrors } from "./form-fields";

export type AgencySettingsView = AgencySettings;

// Any field of this form; the helpers below need only its name, id, errors and value.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Field = FieldMetadata<any, any, any>;

const percent = (share: number) => Number((share * 100).toFixed(2));
const formatNumber = (value: number, digits = 2) => value.toLocaleString("en-US", { maximumFractionDigits: digits });

function Hint({ id, children }: { id: string; children: React.ReactNode }) {
  return (
    <p id={id} className="text-xs text-slate-ft">
      {children}
    </p>
  );
}

function NumberField({
  label,
  field,
  unit,
  hint,
  after,
}: {
  label: string;
  field: Field;
  unit: string;
  hint: React.ReactNode;
  after?: React.ReactNode;
}) {
  const props = getInputProps(field, { type: "text", ariaDescribedBy: `${field.id}-hint` });
  return (
    <div>
      <label htmlFor={field.id} className="field-label">
        {label} ({unit})
      </label>
      <Hint id={`${field.id}-hint`}>{hint}</Hint>
      <div className="flex items-center gap-2">
        <input {...props} key={props.key} inputMode="decimal" className="field-input max-w-40" autoComplete="off" />
        <span aria-hidden="true">{unit}</span>
        {after}
      </div>
      <ErrorList id={field.errorId} errors={field.errors} />
    </div>
  );
}

function RecipientsField({ label, field, hint }: { label: string; field: Field; hint: string }) {
  const props = getTextareaProps(field, { ariaDescribedBy: `${field.id}-hint` });
  return (
    <div>
      <label htmlFor={field.id} className="field-label">
        {label}
      </label>
      <Hint id={`${field.id}-hint`}>
        {hint} One address a line, or separated by commas; at most {MAX_RECIPIENTS}.
      </Hint>
      <textarea {...props} key={props.key} rows={3} className="field-input" autoComplete="off" />
      <ErrorList id={field.errorId} errors={field.errors} />
    </div>
  );
}

function dueRuleLabel(key: string): string {
  if (!isDueRuleKey(key)) return `${key} (not a known rule; federal FOIA applies)`;
  const rule = RECORDS_DUE_RULES[key];
  return `${rule.label} — ${rule.source}`;
}

function CurrentValues({ settings }: { settings: AgencySettingsView }) {
  const rows: [string, string][] = [
    ["Agency name", settings.name],
    ["Time zone", settings.timeZone],
    ["Units shown first", DISPLAY_UNIT_LABELS[settings.displayUnits]],
    ["Incident number prefix", `${settings.eventNumberPrefix} (e.g. ${settings.eventNumberPrefix}-2026-0001)`],
    [
      "Waterway buffer",
      `${formatNumber(settings.waterwayBufferM)} m (${formatNumber(feetFromMetres(settings.waterwayBufferM), 1)} ft). ${WATERWAY_BUFFER_BASIS}`,
    ],
    ["Drawdown tolerance", `${formatNumber(percent(settings.drawdownToleranceShare))} %`],
    ["PFAS threshold", `${formatNumber(settings.pfasReportableLb, 4)} lb in 24 h`],
    ["Class A accuracy band", `± ${formatNumber(percent(settings.classAAccuracyShare))} %`],
    ["Foam system accuracy test every", `${settings.accuracyTestIntervalMonths} months`],
    ["Foam system flush every", `${settings.flushIntervalDays} days`],
    ["Report recipients", settings.reportRecipients.join(", ") || "none"],
    ["Release alert recipients", settings.releaseAlertRecipients.join(", ") || "none"],
    ["Records due-date rule", dueRuleLabel(settings.recordsDueRule)],
    ["Records office closes", settings.recordsOfficeCloses],
    ["Closure days", settings.recordsClosureDays.join(", ") || "none"],
    ["Withholding rule", settings.recordsWithholdingRule],
    ["Release alerts to the chief", settings.releaseAlertsToChief ? "Yes" : "No"],
    [
      "Attachments",
      `at most ${settings.attachmentMaxMb} MB a file and ${settings.attachmentsPerEvent} files a report; removed files kept ${settings.attachmentRetentionDays} days`,
    ],
    ["Quality sample interval", `${settings.qualitySampleIntervalMonths} months (NFPA 11 §13.2.6)`],
    [
      "Typical Class B attack",
      `${formatNumber(settings.classBAttackSolutionGpm)} gpm of foam solution at ${formatNumber(settings.classBAttackPercent)} %`,
    ],
  ];
  return (
    <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
      {rows.map(([label, value]) => (
        <div key={label} className="contents">
          <dt className="font-semibold">{label}</dt>
          <dd>{value}</dd>
        </div>
      ))}
    </dl>
  );
}

/** The agency's settings: an editable form for administrators, the same fields read-only for others. */
export function AgencySettingsForm({
  settings,
  timeZones,
  readOnly,
  lastResult,
  conflict,
}: {
  settings: AgencySettingsView;
  timeZones: string[];
  readOnly: boolean;
  lastResult?: SubmissionResult<string[]>;
  conflict?: AgencySettingsView;
}) {
  const navigation = useNavigation();
  const saving = navigation.state === "submitting";
  const version = conflict?.version ?? settings.version;
  const [form, fields] = useForm({
    id: "agency-settings",
    lastResult,
    constraint: getZodConstraint(AgencySettingsSchema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    defaultValue: {
      name: settings.name,
      timeZone: settings.timeZone,
      displayUnits: settings.displayUnits,
      eventNumberPrefix: settings.eventNumberPrefix,
      waterwayBufferM: String(settings.waterwayBufferM),
      drawdownTolerancePercent: String(percent(settings.drawdownToleranceShare)),
      pfasReportableLb: String(settings.pfasReportableLb),
      classAAccuracyPercent: String(percent(settings.classAAccuracyShare)),
      accuracyTestIntervalMonths: String(settings.accuracyTestIntervalMonths),
      flushIntervalDays: String(settings.flushIntervalDays),
      reportRecipients: settings.reportRecipients.join("\n"),
      releaseAlertRecipients: settings.releaseAlertRecipients.join("\n"),
      recordsDueRule: settings.recordsDueRule,
      recordsOfficeCloses: settings.recordsOfficeCloses,
      recordsClosureDays: settings.recordsClosureDays.join("\n"),
      recordsWithholdingRule: settings.recordsWithholdingRule,
      attachmentMaxMb: String(settings.attachmentMaxMb),
      attachmentsPerEvent: String(settings.attachmentsPerEvent),
      attachmentRetentionDays: String(settings.attachmentRetentionDays),
      qualitySampleIntervalMonths: String(settings.qualitySampleIntervalMonths),
      classBAttackSolutionGpm: String(settings.classBAttackSolutionGpm),
      classBAttackPercent: String(settings.classBAttackPercent),
    },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: AgencySettingsSchema }),
  });
  const bufferMetres = Number(fields.waterwayBufferM.value);
  const bufferFeet =
    fields.waterwayBufferM.value && Number.isFinite(bufferMetres) && bufferMetres > 0
      ? `= ${formatNumber(feetFromMetres(bufferMetres), 1)} ft`
      : null;
  const nameProps = getInputProps(fields.name, { type: "text" });
  const zoneProps = getInputProps(fields.timeZone, { type: "text", ariaDescribedBy: `${fields.timeZone.id}-hint` });
  const prefixProps = getInputProps(fields.eventNumberPrefix, {
    type: "text",
    ariaDescribedBy: `${fields.eventNumberPrefix.id}-hint`,
  });
  const unitProps = getSelectProps(fields.displayUnits, { ariaDescribedBy: `${fields.displayUnits.id}-hint` });
  const ruleProps = getSelectProps(fields.recordsDueRule, { ariaDescribedBy: `${fields.recordsDueRule.id}-hint` });
  const closesProps = getInputProps(fields.recordsOfficeCloses, {
    type: "time",
    ariaDescribedBy: `${fields.recordsOfficeCloses.id}-hint`,
  });
  const closureProps = getTextareaProps(fields.recordsClosureDays, {
    ariaDescribedBy: `${fields.recordsClosureDays.id}-hint`,
  });
  const withholdingProps = getTextareaProps(fields.recordsWithholdingRule, {
    ariaDescribedBy: `${fields.recordsWithholdingRule.id}-hint`,
  });
  const chosenRule = isDueRuleKey(fields.recordsDueRule.value) ? RECORDS_DUE_RULES[fields.recordsDueRule.value] : null;

  return (
    <Form method="post" className="space-y-6" {...getFormProps(form)}>
      <input type="hidden" name="version" value={version} key={version} readOnly />
      <FormErrors id={form.errorId} errors={form.errors} />
      {conflict ? (
        <section className="card max-w-3xl" aria-labelledby="conflict-title">
          <h2 id="conflict-title" className="text-lg font-semibold">
            Saved by someone else in the meantime
          </h2>
          <p className="text-sm">
            These are the settings as they are stored now. Your typing is kept in the form below; compare the two and
            save again to replace the stored values with yours.
          </p>
          <CurrentValues settings={conflict} />
        </section>
      ) : null}
      <fieldset disabled={readOnly || saving} className="space-y-6">
        <section className="card max-w-3xl space-y-4" aria-labelledby="agency-title">
          <h2 id="agency-title" className="text-lg font-semibold">
            Agency
          </h2>
          <div>
            <label htmlFor={fields.name.id} className="field-label">
              Agency name
            </label>
            <input {...nameProps} key={nameProps.key} className="field-input" autoComplete="organization" />
            <ErrorList id={fields.name.errorId} errors={fields.name.errors} />
          </div>
          <div>
            <label htmlFor={fields.timeZone.id} className="field-label">
              Time zone
            </label>
            <Hint id={`${fields.timeZone.id}-hint`}>
              An IANA time zone name, for example America/Chicago. Times are typed and shown in it; stored times do not
              move when it changes.
            </Hint>
            <input
              {...zoneProps}
              key={zoneProps.key}
              list="agency-time-zones"
              className="field-input max-w-sm"
              autoComplete="off"
            />
            <datalist id="agency-time-zones">
              {timeZones.map((zone) => (
                <option key={zone} value={zone} />
              ))}
            </datalist>
            <ErrorList id={fields.timeZone.errorId} errors={fields.timeZone.errors} />
          </div>
          <div>
            <label htmlFor={fields.displayUnits.id} className="field-label">
              Units shown first
            </label>
            <Hint id={`${fields.displayUnits.id}-hint`}>
              Pages and exports show US gallons with litres beside them today; this choice is kept for the order.
            </Hint>
            <select {...unitProps} key={unitProps.key} className="field-input max-w-sm">
              {DISPLAY_UNITS.map((unit) => (
                <option key={unit} value={unit}>
                  {DISPLAY_UNIT_LABELS[unit]}
                </option>
              ))}
            </select>
            <ErrorList id={fields.displayUnits.errorId} errors={fields.displayUnits.errors} />
          </div>
          <div>
            <label htmlFor={fields.eventNumberPrefix.id} className="field-label">
              Incident number prefix
            </label>
            <Hint id={`${fields.eventNumberPrefix.id}-hint`}>
              Starts the numbers given to incident reports saved without a dispatch number, e.g. AB-2026-0042. One
              letter, then up to five letters or digits; TR, PT and FL are kept for training, tests and flushes. Numbers
              already given do not change.
            </Hint>
            <input
              {...prefixProps}
              key={prefixProps.key}
              className="field-input max-w-40"
              autoComplete="off"
              autoCapitalize="characters"
            />
            <ErrorList id={fields.eventNumberPrefix.errorId} errors={fields.eventNumberPrefix.errors} />
          </div>
        </section>

        <section className="card max-w-3xl space-y-4" aria-labelledby="thresholds-title">
          <h2 id="thresholds-title" className="text-lg font-semibold">
            Buffers and thresholds
          </h2>
          <p className="caution" role="note" aria-label="Thresholds caution">
            These figures are defaults that support your own judgement; they are not legal limits. Local codes, permits
            and state and federal law govern what you must avoid and report — set the values they require and check them
            with your regulator.
          </p>
          <NumberField
            label="Waterway buffer"
            field={fields.waterwayBufferM}
            unit="m"
            hint="Default 91.44 m = 300 ft: USDA Forest Service aerial application guide — local rules govern. Ground use has no fixed distance. A change rechecks every event's stored location checks."
            after={<span className="text-sm text-slate-ft">{bufferFeet}</span>}
          />
          <NumberField
            label="Tank drawdown tolerance"
            field={fields.drawdownTolerancePercent}
            unit="%"
            hint="How far computed concentrate may differ from the tank refill or level readings before a report is warned. Default 15 %: common practice, no published source."
          />
          <NumberField
            label="PFAS threshold in any 24 hours"
            field={fields.pfasReportableLb}
            unit="lb"
            hint="Default 1 lb in 24 h: CERCLA reportable quantity for PFOA/PFOS, 40 CFR 302.4 — state law may be stricter. The quarterly workbook compares the heaviest 24 hours with it."
          />
          <NumberField
            label="Class A proportioning accuracy band, ± share of the set percentage"
            field={fields.classAAccuracyPercent}
            unit="%"
            hint="Default 30 %: from memory, low confidence — no published figure for apparatus Class A systems was found; use your acceptance-test criteria. Class A accuracy tests of foam systems pass within this band."
          />
          <NumberField
            label="Foam system accuracy test interval"
            field={fields.accuracyTestIntervalMonths}
            unit="months"
            hint="Default 12 months (an annual test): common practice, no source. Reminders go to the station's officers 30 days ahead and when overdue."
          />
          <NumberField
            label="Foam system scheduled flush interval"
            field={fields.flushIntervalDays}
            unit="days"
            hint="Default 90 days: common practice, no source. A flush after use or before a product change counts too."
          />
          <NumberField
            label="Quality sample interval for stored concentrate"
            field={fields.qualitySampleIntervalMonths}
            unit="months"
            hint="NFPA 11 (2021) §13.2.6 calls for periodic samples of concentrate for quality tests. Default 12 months: common practice, no source for the interval. A lot in stock whose last sample is older is flagged and alerted."
          />
          <NumberField
            label="Typical Class B attack: foam-solution flow"
            field={fields.classBAttackSolutionGpm}
            unit="gpm"
            hint="Stock readiness says how many minutes of this attack the Class B concentrate on hand supports. Default 95 gpm: common practice, no source."
          />
          <NumberField
            label="Typical Class B attack: percentage"
            field={fields.classBAttackPercent}
            unit="%"
            hint="Of foam solution (NFPA 11 §12.6.5 convention). Default 3 %: 95 gpm at 3 % draws 2.85 gpm of concentrate."
          />
        </section>

        <section className="card max-w-3xl space-y-4" aria-labelledby="mail-title">
          <h2 id="mail-title" className="text-lg font-semibold">
            Who gets mail
          </h2>
          <RecipientsField
            label="Quarterly report recipients"
            field={fields.reportRecipients}
            hint="They receive the quarterly runoff and PFAS workbook when it is sent."
          />
          <RecipientsField
            label="Release alert recipients"
            field={fields.releaseAlertRecipients}
            hint="They receive an alert, with every environmental officer, when a filed report used PFAS foam or sent runoff to a storm drain or surface water."
          />
          <label className="flex items-start gap-2">
            <input
              type="checkbox"
              name={fields.releaseAlertsToChief.name}
              defaultChecked={settings.releaseAlertsToChief}
              className="mt-1"
            />
            <span>Send release alerts to every chief as well</span>
          </label>
          <p className="caution" role="note" aria-label="Mail caution">
            Mail from Foamtally is a notice, not a regulatory report: check who must be told, how and by when under your
            permits and state and federal law.
          </p>
        </section>

        <section className="card max-w-3xl space-y-4" aria-labelledby="records-title">
          <h2 id="records-title" className="text-lg font-semibold">
            Public-records requests
          </h2>
          <p className="caution" role="note" aria-label="Public-records caution">
            The state&apos;s public-records law and the agency&apos;s counsel decide when an answer is due and what may
            be withheld; these settings only count days and word the cover letter. Check the rule, the closing time and
            the closure days with counsel.
          </p>
          <div>
            <label htmlFor={fields.recordsDueRule.id} className="field-label">
              Due-date rule
            </label>
            <Hint id={`${fields.recordsDueRule.id}-hint`}>
              The days the law gives to answer, counted from the day of receipt. Each rule names its statute.
            </Hint>
            <div className="flex flex-wrap items-center gap-2">
              <select {...ruleProps} key={ruleProps.key} className="field-input max-w-sm">
                {DUE_RULE_KEYS.map((key) => (
                  <option key={key} value={key}>
                    {RECORDS_DUE_RULES[key].label} — {RECORDS_DUE_RULES[key].source}
                  </option>
                ))}
              </select>
              {chosenRule ? <span className="text-sm text-slate-ft">{chosenRule.source}</span> : null}
            </div>
            <ErrorList id={fields.recordsDueRule.errorId} errors={fields.recordsDueRule.errors} />
          </div>
          <div>
            <label htmlFor={fields.recordsOfficeCloses.id} className="field-label">
              Records office closes at
            </label>
            <Hint id={`${fields.recordsOfficeCloses.id}-hint`}>
              HH:MM on a 24-hour clock, in the agency&apos;s time zone. A request received at or after this time counts
              from the next business day. Default 17:00 (common practice, no source).
            </Hint>
            <input {...closesProps} key={closesProps.key} className="field-input max-w-40" autoComplete="off" />
            <ErrorList id={fields.recordsOfficeCloses.errorId} errors={fields.recordsOfficeCloses.errors} />
          </div>
          <div>
            <label htmlFor={fields.recordsClosureDays.id} className="field-label">
              The agency&apos;s own closure days
            </label>
            <Hint id={`${fields.recordsClosureDays.id}-hint`}>
              One date a line, written YYYY-MM-DD (e.g. 2026-12-24); at most {MAX_CLOSURE_DAYS}. Weekends and the
              federal holidays of 5 U.S.C. 6103 are skipped already.
            </Hint>
            <textarea {...closureProps} key={closureProps.key} rows={4} className="field-input max-w-sm" />
            <ErrorList id={fields.recordsClosureDays.errorId} errors={fields.recordsClosureDays.errors} />
          </div>
          <div>
            <label htmlFor={fields.recordsWithholdingRule.id} className="field-label">
              Withholding rule named in cover letters
            </label>
            <Hint id={`${fields.recordsWithholdingRule.id}-hint`}>
              The name of the state law&apos;s exemptions a release package cites for what it withholds; at most 300
              characters.
            </Hint>
            <textarea {...withholdingProps} key={withholdingProps.key} rows={2} className="field-input" />
            <ErrorList id={fields.recordsWithholdingRule.errorId} errors={fields.recordsWithholdingRule.errors} />
          </div>
          <p className="text-sm" role="note" aria-label="Due dates note">
            A new rule, closing time or closure days apply to requests received after the save. Requests already
            received keep their due dates; the clerk moves one with an extension and its reason.
          </p>
        </section>

        <section className="card max-w-3xl space-y-4" aria-labelledby="attachments-settings-title">
          <h2 id="attachments-settings-title" className="text-lg font-semibold">
            Attached files
          </h2>
          <NumberField
            label="Largest attached file"
            field={fields.attachmentMaxMb}
            unit="MB"
            hint="Default 25 MB: room for a phone photo or a scanned manifest (common practice, no source). At most 100 MB; a larger file is refused before it is read, with this limit named."
          />
          <NumberField
            label="Most files on one report"
            field={fields.attachmentsPerEvent}
            unit="files"
            hint="Default 40 (common practice, no source)."
          />
          <NumberField
            label="Days a removed file is kept"
            field={fields.attachmentRetentionDays}
            unit="days"
            hint="A removed attachment leaves the report at once; its file stays in the object store this long, then the clean-up deletes it. Default 1,095 days (3 years, common practice, no source): set it to your records-retention schedule."
          />
        </section>
      </fieldset>
      {readOnly ? (
        <p className="text-sm text-slate-ft">You can read these settings; an administrator changes them.</p>
      ) : (
        <button type="submit" className="btn-primary" disabled={saving}>
          {saving ? "Saving…" : "Save settings"}
        </button>
      )}
    </Form>
  );
}
