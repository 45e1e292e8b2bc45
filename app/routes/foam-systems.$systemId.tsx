import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/foam-systems.$systemId";
import { FormErrors, SelectField, TextAreaField, TextField } from "~/components/form-fields";
import { can } from "~/lib/access";
import { requireCapability } from "~/lib/access.server";
import { AccuracyTestFormSchema, MaintenanceFormSchema } from "~/lib/foam/system-forms";
import {
  ACCURACY_TEST_METHOD_LABELS,
  ACCURACY_TEST_METHODS,
  FLEET_STATUS_LABELS,
  FLUSH_REASON_LABELS,
  FLUSH_REASONS,
  FOAM_CLASS_LABELS,
  FOAM_CLASSES,
  FOAM_SYSTEM_TYPE_LABELS,
  MAINTENANCE_KIND_LABELS,
  MAINTENANCE_KINDS,
  PERCENT_OF_LABELS,
} from "~/lib/foam/vocabulary";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, invariantResponse, requireRecordId } from "~/lib/http.server";
import { refusalData } from "~/lib/refusal";
import { flashHeaders } from "~/lib/session.server";
import { listActiveProducts } from "~/models/catalogue.server";
import { getFoamSystem, recordAccuracyTest, recordMaintenance } from "~/models/foam-system.server";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.system ? `${data.system.apparatus} ${data.system.name}` : "Foam system"} · Foamtally` },
];

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "systems.read");
  const id = requireRecordId(request, params.systemId, "No such foam system.");
  const [system, products] = await Promise.all([getFoamSystem(id), listActiveProducts()]);
  invariantResponse(system, "No such foam system.");
  return {
    system,
    products: products.map((product) => ({
      value: String(product.id),
      label: `${product.name}${product.pfasContaining ? " (contains PFAS)" : ""}`,
    })),
    canMaintain: can(user, "systems.maintain"),
    canEdit: can(user, "apparatus.edit"),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "systems.maintain");
  const id = requireRecordId(request, params.systemId, "No such foam system.");
  const formData = await readFormData(request, [MaintenanceFormSchema, AccuracyTestFormSchema]);
  if (formData.get("intent") === "test") {
    const submission = parseWithZod(formData, { schema: AccuracyTestFormSchema });
    if (submission.status !== "success") {
      return data({ intent: "test" as const, result: submission.reply() }, { status: 400 });
    }
    const saved = await recordAccuracyTest(id, submission.value, user, clientAddress(request));
    if ("kind" in saved) return refusalData(submission, saved, { intent: "test" as const });
    const verdict = saved.result.pass ? "passed" : "failed: the system is out of tolerance";
    throw redirect(`/foam-systems/${id}`, {
      headers: await flashHeaders(
        request,
        `Test recorded: ${Number(saved.result.achievedPercent.toFixed(3))} % of solution, ${verdict}.`,
      ),
    });
  }
  const submission = parseWithZod(formData, { schema: MaintenanceFormSchema });
  if (submission.status !== "success") {
    return data({ intent: "maintenance" as const, result: submission.reply() }, { status: 400 });
  }
  const saved = await recordMaintenance(id, submission.value, user, clientAddress(request));
  if ("kind" in saved) return refusalData(submission, saved, { intent: "maintenance" as const });
  throw redirect(`/foam-systems/${id}`, {
    headers: await flashHeaders(
      request,
      saved.createdReport
        ? `${MAINTENANCE_KIND_LABELS[submission.value.kind]} recorded, with its usage report ${saved.createdReport} filed: its water and concentrate are counted there.`
        : `${MAINTENANCE_KIND_LABELS[submission.value.kind]} recorded.`,
    ),
  });
}

const figure = (value: number | null, unit: string) => (value == null ? "—" : `${value} ${unit}`);

export default function FoamSystemPage({ loaderData, actionData }: Route.ComponentProps) {
  const { system, products, canMaintain, canEdit } = loaderData;
  const history = system.pfasHistory;
  return (
    <div className="max-w-5xl space-y-6">
      <p>
        <Link to="/foam-systems" className="text-pond-700 underline">
          ← Foam systems
        </Link>
      </p>
      <h1 className="text-2xl font-bold">
        {system.apparatus} · {system.name}
      </h1>
      <section className="card space-y-2" aria-labelledby="state-title">
        <h2 id="state-title" className="text-lg font-semibold">
          State
        </h2>
        <p data-testid="system-status" className={system.status === "out_of_tolerance" ? "caution" : undefined}>
          {FLEET_STATUS_LABELS[system.status]}
          {system.statusReason ? ` — ${system.statusReason}` : ""}
        </p>
        {system.status === "out_of_tolerance" ? (
          <p className="text-sm">
            Usage lines on this system carry a warning until a passing retest, and the quarterly workbook lists them.
          </p>
        ) : null}
        <dl className="grid gap-2 text-sm sm:grid-cols-3">
          <div>
            <dt className="font-semibold">Type</dt>
            <dd>{FOAM_SYSTEM_TYPE_LABELS[system.type]}</dd>
          </div>
          <div>
            <dt className="font-semibold">The controller sets</dt>
            <dd>{PERCENT_OF_LABELS[system.percentOf]}</dd>
          </div>
          <div>
            <dt className="font-semibold">Concentrate rate</dt>
            <dd>
              {figure(system.minConcentrateGpm, "gpm")} to {figure(system.maxConcentrateGpm, "gpm")}
            </dd>
          </div>
          <div>
            <dt className="font-semibold">Water flow</dt>
            <dd>
              {figure(system.waterFlowMinGpm, "gpm")} to {figure(system.waterFlowMaxGpm, "gpm")}
            </dd>
          </div>
          <div>
            <dt className="font-semibold">Tanks</dt>
            <dd>
              {system.tanks
                .map(
                  (tank) => `${tank.name} ${figure(tank.capacityGal, "gal")}${tank.product ? `, ${tank.product}` : ""}`,
                )
                .join("; ") || "—"}
            </dd>
          </div>
          <div>
            <dt className="font-semibold">Outlets served</dt>
            <dd>{system.outlets.join(", ") || "— (the apparatus's only system serves every outlet)"}</dd>
          </div>
          <div>
            <dt className="font-semibold">Next accuracy test due</dt>
            <dd>{system.nextTestDue}</dd>
          </div>
          <div>
            <dt className="font-semibold">Next flush due</dt>
            <dd>{system.nextFlushDue}</dd>
          </div>
        </dl>
        {canEdit ? (
          <p>
            <Link to={`/apparatus/${system.apparatusId}/foam-systems/${system.id}`} className="text-pond-700 underline">
              Change this system&rsquo;s figures
            </Link>
          </p>
        ) : null}
      </section>

      <section className="card space-y-2" aria-labelledby="pfas-title">
        <h2 id="pfas-title" className="text-lg font-semibold">
          PFAS history of {system.apparatus}
        </h2>
        <p className="text-sm">
          Legacy PFAS returns from wetted surfaces (tank, piping, proportioner) into a replacement foam; a changeover
          from a PFAS-containing foam needs its rinse procedure recorded, and a verification sample where one was taken.
        </p>
        <p data-testid="pfas-history">
          Products carried: {history.productsCarried.map((product) => product.name).join(", ") || "none recorded"}.
          {history.lastPfasUseAt ? ` Last PFAS-containing use: ${history.lastPfasUseAt.replace("T", " ")}.` : ""}{" "}
          {history.changeover.state === "never_carried"
            ? "No PFAS-containing foam recorded on this apparatus."
            : history.changeover.state === "not_recorded"
              ? "No changeover away from PFAS-containing foam is recorded since its last use."
              : `Changed over on ${history.changeover.on.replace("T", " ")}; rinse: ${history.changeover.rinseProcedure || "not recorded"}; verification: ${history.changeover.verificationResult || "no sample result"}.`}
        </p>
      </section>

      {canMaintain ? (
        <div className="grid gap-6 lg:grid-cols-2">
          <MaintenanceForm
            products={products}
            lastResult={actionData?.intent === "maintenance" ? actionData.result : undefined}
          />
          <AccuracyTestForm
            products={products}
            lastResult={actionData?.intent === "test" ? actionData.result : undefined}
          />
        </div>
      ) : null}

      <section className="card overflow-x-auto" aria-labelledby="tests-title">
        <h2 id="tests-title" className="text-lg font-semibold">
          Accuracy tests
        </h2>
        {system.tests.length === 0 ? (
          <p className="mt-2 text-sm">No tests recorded: an acceptance test is owed.</p>
        ) : (
          <table className="data-table mt-3">
            <thead>
              <tr>
                <th scope="col">When</th>
                <th scope="col">Method</th>
                <th scope="col">Rated</th>
                <th scope="col">Achieved (of solution)</th>
                <th scope="col">Band</th>
                <th scope="col">R²</th>
                <th scope="col">Result</th>
                <th scope="col">Tester</th>
                <th scope="col">Record</th>
              </tr>
            </thead>
            <tbody>
              {system.tests.map((test) => (
                <tr key={test.id} data-testid="test-row">
                  <td>{test.testedAt.replace("T", " ")}</td>
                  <td>{ACCURACY_TEST_METHOD_LABELS[test.method].split(" (")[0]}</td>
                  <td>
                    {test.ratedPercent} % {FOAM_CLASS_LABELS[test.foamClass]}
                  </td>
                  <td>{Number(test.achievedPercent.toFixed(3))} %</td>
                  <td>
                    {test.band[0]}–{test.band[1]} %
                  </td>
                  <td>{test.r2 == null ? "—" : test.r2.toFixed(4)}</td>
                  <td className={test.pass ? undefined : "font-semibold text-red-800"}>
                    {test.pass ? "Pass" : "Fail"}
                  </td>
                  <td>{test.testedBy}</td>
                  <td>
                    <Link to={`/foam-systems/${system.id}/tests/${test.id}`} className="text-pond-700 underline">
                      Test and printouts
                    </Link>
                    {" · "}
                    <a
                      href={`/foam-systems/${system.id}/tests/${test.id}/record.pdf`}
                      className="text-pond-700 underline"
                    >
                      PDF
                    </a>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
        <p className="mt-2 text-xs text-slate-ft">
          Class B: NFPA 11 (2021) §12.6.5 — not less than the rated percentage, nor more than 30 % above it or 1
          percentage point above it, whichever is less. Class A: the agency&rsquo;s band setting (no published figure
          was found).
        </p>
      </section>

      <section className="card overflow-x-auto" aria-labelledby="maintenance-title">
        <h2 id="maintenance-title" className="text-lg font-semibold">
          Maintenance
        </h2>
        {system.maintenance.length === 0 ? (
          <p className="mt-2 text-sm">Nothing recorded yet.</p>
        ) : (
          <table className="data-table mt-3">
            <thead>
              <tr>
                <th scope="col">When</th>
                <th scope="col">What</th>
                <th scope="col">Water / to disposal</th>
                <th scope="col">Usage report</th>
                <th scope="col">By</th>
                <th scope="col">Notes</th>
              </tr>
            </thead>
            <tbody>
              {system.maintenance.map((record) => (
                <tr key={record.id} data-testid="maintenance-row">
                  <td>{record.performedAt.replace("T", " ")}</td>
                  <td>
                    {MAINTENANCE_KIND_LABELS[record.kind]}
                    {record.flushReason ? ` (${FLUSH_REASON_LABELS[record.flushReason].toLowerCase()})` : ""}
                    {record.kind === "changeover"
                      ? `: ${record.fromProduct ?? "?"} → ${record.toProduct ?? "?"}${record.verificationResult ? `; verification ${record.verificationResult}` : ""}`
                      : ""}
                  </td>
                  <td>
                    {figure(record.waterGal, "gal")} / {figure(record.concentrateDisposedGal, "gal")}
                  </td>
                  <td>
                    {record.eventId ? (
                      <Link to={`/events/${record.eventId}`} className="text-pond-700 underline">
                        {record.eventNumber}
                      </Link>
                    ) : (
                      "—"
                    )}
                  </td>
                  <td>{record.performedBy}</td>
                  <td>{[record.rinseProcedure, record.notes].filter(Boolean).join(" · ") || "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </div>
  );
}

type FormProps = {
  products: Array<{ value: string; label: string }>;
  lastResult?: SubmissionResult<string[]>;
};

function MaintenanceForm({ products, lastResult }: FormProps) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "maintenance",
    lastResult,
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: MaintenanceFormSchema }),
    defaultValue: { kind: "flush", flushReason: "after_use" },
  });
  return (
    <Form method="post" className="card space-y-3" {...getFormProps(form)} aria-labelledby="maintenance-form-title">
      <h2 id="maintenance-form-title" className="text-lg font-semibold">
        Record maintenance
      </h2>
      <input type="hidden" name="intent" value="maintenance" />
      <FormErrors id={form.errorId} errors={form.errors} />
      <SelectField
        label="What was done"
        field={fields.kind}
        options={MAINTENANCE_KINDS.map((kind) => ({ value: kind, label: MAINTENANCE_KIND_LABELS[kind] }))}
      />
      <SelectField
        label="Why it was flushed"
        field={fields.flushReason}
        placeholder="Not a flush"
        options={FLUSH_REASONS.map((reason) => ({ value: reason, label: FLUSH_REASON_LABELS[reason] }))}
      />
      <TextField label="When" field={fields.performedAt} type="datetime-local" />
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Water used (gal)" field={fields.waterGal} inputMode="decimal" />
        <TextField
          label="Concentrate sent to disposal (gal)"
          field={fields.concentrateDisposedGal}
          inputMode="decimal"
        />
      </div>
      <TextField
        label="Usage report number"
        field={fields.eventNumber}
        hint="A flush that flowed water or concentrate is counted through its usage report (kind “flush”): enter its number, or leave it blank and a filed report is made for this flush from the station's location, so the volumes are counted once."
      />
      <fieldset className="space-y-3 rounded-md border border-stone-200 p-3">
        <legend className="text-sm font-semibold">Changeover only</legend>
        <SelectField label="Product taken out" field={fields.fromProductId} placeholder="—" options={products} />
        <SelectField label="Product now loaded" field={fields.toProductId} placeholder="—" options={products} />
        <TextAreaField
          label="Rinse procedure"
          field={fields.rinseProcedure}
          hint="Required when the product taken out contains PFAS."
          rows={3}
        />
        <TextField label="Verification sample result" field={fields.verificationResult} hint="Optional." />
      </fieldset>
      <TextAreaField label="Notes" field={fields.notes} rows={2} />
      <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
        Record maintenance
      </button>
    </Form>
  );
}

const CALIBRATION_ROWS = 5;

function AccuracyTestForm({ products, lastResult }: FormProps) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "accuracy-test",
    lastResult,
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: AccuracyTestFormSchema }),
    defaultValue: {
      method: "refractometer",
      foamClass: "B",
      calibration: Array.from({ length: CALIBRATION_ROWS }, () => ({})),
    },
  });
  const rows = fields.calibration.getFieldList();
  return (
    <Form method="post" className="card space-y-3" {...getFormProps(form)} aria-labelledby="test-form-title">
      <h2 id="test-form-title" className="text-lg font-semibold">
        Record an accuracy test
      </h2>
      <input type="hidden" name="intent" value="test" />
      <FormErrors id={form.errorId} errors={form.errors} />
      <TextField label="When" field={fields.testedAt} type="datetime-local" />
      <SelectField
        label="Method"
        field={fields.method}
        options={ACCURACY_TEST_METHODS.map((method) => ({ value: method, label: ACCURACY_TEST_METHOD_LABELS[method] }))}
      />
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField
          label="Foam class"
          field={fields.foamClass}
          options={FOAM_CLASSES.map((foamClass) => ({ value: foamClass, label: FOAM_CLASS_LABELS[foamClass] }))}
        />
        <SelectField label="Product" field={fields.productId} placeholder="—" options={products} />
        <TextField label="Rated percent" field={fields.ratedPercent} inputMode="decimal" />
        <TextField label="Set percent" field={fields.setPercent} inputMode="decimal" />
        <TextField label="Water flow (gpm)" field={fields.waterFlowGpm} inputMode="decimal" />
      </div>
      <fieldset className="space-y-2 rounded-md border border-stone-200 p-3">
        <legend className="text-sm font-semibold">Refractometer or conductivity</legend>
        <p className="text-xs text-slate-ft">
          Known mixes as a percentage of solution, e.g. 0, half the rated, the rated and twice the rated percent, and
          the reading of each; then the discharge sample&rsquo;s reading. Leave unused rows blank.
        </p>
        {rows.map((row, index) => {
          const point = row.getFieldset();
          return (
            <div key={row.key} className="grid grid-cols-2 gap-3">
              <TextField label={`Mix ${index + 1} percent`} field={point.percent} inputMode="decimal" />
              <TextField label={`Mix ${index + 1} reading`} field={point.reading} inputMode="decimal" />
            </div>
          );
        })}
        <FormErrors id={fields.calibration.errorId} errors={fields.calibration.errors} />
        <TextField label="Sample reading" field={fields.sampleReading} inputMode="decimal" />
      </fieldset>
      <fieldset className="space-y-2 rounded-md border border-stone-200 p-3">
        <legend className="text-sm font-semibold">Flow measurement</legend>
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label="Concentrate drawn (gal)" field={fields.concentrateGal} inputMode="decimal" />
          <TextField label="Metered water (gal)" field={fields.waterGal} inputMode="decimal" />
        </div>
      </fieldset>
      <TextAreaField label="Notes" field={fields.notes} rows={2} />
      <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
        Record the test
      </button>
    </Form>
  );
}
