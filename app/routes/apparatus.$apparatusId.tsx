import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/apparatus.$apparatusId";
import { CheckboxField, FormErrors, SelectField, TextField } from "~/components/form-fields";
import { requireCapability } from "~/lib/access.server";
import { ApparatusFormSchema } from "~/lib/catalogue/apparatus-form";
import {
  APPLICATION_METHOD_LABELS,
  APPLICATION_METHODS,
  FLOW_BASES,
  FLOW_BASIS_LABELS,
  FOAM_SYSTEM_TYPE_LABELS,
  PERCENT_OF_LABELS,
  PROPORTIONER_PERCENT_OF,
  PROPORTIONER_TYPE_LABELS,
  PROPORTIONER_TYPES,
} from "~/lib/foam/vocabulary";
import { formVersion, StaleRecordError, staleRecordMessage, submittedVersion } from "~/lib/catalogue/record-version";
import { recordIdOf } from "~/lib/record-id";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, httpError, invariantResponse } from "~/lib/http.server";
import { conflict, refusalData } from "~/lib/refusal";
import { flashHeaders } from "~/lib/session.server";
import {
  DuplicateCodeError,
  getApparatus,
  listStations,
  saveApparatus,
  UnknownStationError,
} from "~/models/apparatus.server";
import { listSystemsOfApparatus } from "~/models/foam-system.server";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.apparatus ? data.apparatus.unitId : "New apparatus"} · Foamtally` },
];

function apparatusIdOf(params: { apparatusId?: string }): number | null {
  if (params.apparatusId === "new") return null;
  const id = recordIdOf(params.apparatusId);
  if (id == null) httpError(404, "No such apparatus.");
  return id;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "apparatus.edit");
  const id = apparatusIdOf(params);
  const stations = await listStations();
  if (id == null) return { apparatus: null, stations, foamSystems: [] };
  const apparatus = await getApparatus(id);
  invariantResponse(apparatus, "No such apparatus.");
  return { apparatus, stations, foamSystems: await listSystemsOfApparatus(id) };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "apparatus.edit");
  const id = apparatusIdOf(params);
  const formData = await readFormData(request, ApparatusFormSchema, { fields: ["version"] });
  const submission = parseWithZod(formData, { schema: ApparatusFormSchema });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 400 });
  try {
    const saved = await saveApparatus(id, submittedVersion(formData), submission.value, user, clientAddress(request));
    invariantResponse(saved, "No such apparatus.");
  } catch (error) {
    if (error instanceof StaleRecordError) {
      return refusalData(submission, conflict(staleRecordMessage("apparatus")));
    }
    if (error instanceof DuplicateCodeError) {
      return data(
        { result: submission.reply({ fieldErrors: { unitId: ["Another apparatus has this unit identifier."] } }) },
        { status: 400 },
      );
    }
    if (error instanceof UnknownStationError) {
      return data(
        { result: submission.reply({ fieldErrors: { stationId: ["That station no longer exists."] } }) },
        { status: 400 },
      );
    }
    throw error;
  }
  throw redirect("/apparatus", {
    headers: await flashHeaders(request, `Saved ${submission.value.unitId}.`),
  });
}

export default function ApparatusPage({ loaderData, actionData }: Route.ComponentProps) {
  const { apparatus, stations, foamSystems } = loaderData;
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "apparatus",
    lastResult: actionData?.result,
    constraint: getZodConstraint(ApparatusFormSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ApparatusFormSchema }),
    defaultValue: apparatus
      ? {
          unitId: apparatus.unitId,
          description: apparatus.description,
          stationId: apparatus.stationId?.toString(),
          concentrateTankGal: apparatus.concentrateTankGal?.toString(),
          proportionerMaxConcentrateGpm: apparatus.proportionerMaxConcentrateGpm?.toString(),
          proportionerType: apparatus.proportionerType ?? undefined,
          waterFlowMinGpm: apparatus.waterFlowMinGpm?.toString(),
          waterFlowMaxGpm: apparatus.waterFlowMaxGpm?.toString(),
          compressedAirCfm: apparatus.compressedAirCfm?.toString(),
          active: apparatus.active ? "on" : undefined,
          outlets: apparatus.outlets.map((outlet) => ({
            name: outlet.name,
            foamCapable: outlet.foamCapable ? "on" : undefined,
            defaultFlowGpm: outlet.defaultFlowGpm?.toString(),
            defaultFlowBasis: outlet.defaultFlowBasis,
            defaultMethod: outlet.defaultMethod ?? undefined,
          })),
        }
      : { active: "on", outlets: [{ name: "", foamCapable: "on", defaultFlowBasis: "water" }] },
  });
  const outlets = fields.outlets.getFieldList();
  return (
    <div className="max-w-4xl space-y-6">
      <p>
        <Link to="/apparatus" className="text-pond-700 underline">
          ← Apparatus and stations
        </Link>
      </p>
      <h1 className="text-2xl font-bold">{apparatus ? `Apparatus ${apparatus.unitId}` : "Add apparatus"}</h1>
      <Form method="post" className="space-y-6" {...getFormProps(form)}>
        <FormErrors id={form.errorId} errors={form.errors} />
        {apparatus ? (
          <input type="hidden" name="version" value={formVersion(actionData?.result, apparatus.version)} />
        ) : null}
        <section className="card space-y-4" aria-labelledby="unit-title">
          <h2 id="unit-title" className="text-lg font-semibold">
            Unit
          </h2>
          <div className="grid gap-4 sm:grid-cols-2">
            <TextField label="Unit identifier" field={fields.unitId} hint="As on the radio, e.g. E1." />
            <SelectField
              label="Station"
              field={fields.stationId}
              placeholder="No station"
              options={stations.map((station) => ({
                value: String(station.id),
                label: `${station.code} — ${station.name}`,
              }))}
            />
          </div>
          <TextField label="Description" field={fields.description} />
          <CheckboxField
            label="In service"
            field={fields.active}
            hint="Out-of-service units are not offered on new reports."
          />
        </section>
        <section className="card space-y-4" aria-labelledby="foam-title">
          <h2 id="foam-title" className="text-lg font-semibold">
            Foam system
          </h2>
          <p className="text-sm text-slate-ft">
            These figures drive the usage warnings of lines on no foam system: a line whose concentrate rate exceeds the
            proportioner&apos;s maximum is flagged with the percentage actually reached. A line on one of the foam
            systems below takes that system&apos;s own figures.
          </p>
          {apparatus ? (
            <div className="rounded-md border border-stone-200 p-3" data-testid="apparatus-foam-systems">
              <h3 className="font-semibold">Foam systems</h3>
              <ul className="mt-1 list-disc pl-5 text-sm">
                {foamSystems.map((system) => (
                  <li key={system.id}>
                    <Link to={`/foam-systems/${system.id}`} className="text-pond-700 underline">
                      {system.name}
                    </Link>{" "}
                    ({FOAM_SYSTEM_TYPE_LABELS[system.type]}
                    {system.outOfTolerance ? ", out of tolerance" : ""}
                    {system.active ? "" : ", out of service"})
                  </li>
                ))}
              </ul>
              <Link to={`/apparatus/${apparatus.id}/foam-systems/new`} className="btn-secondary mt-2 inline-block">
                Add a foam system
              </Link>
            </div>
          ) : null}
          <div className="grid gap-4 sm:grid-cols-2">
            <TextField label="Concentrate tank (gal)" field={fields.concentrateTankGal} inputMode="decimal" />
            <SelectField
              label="Proportioner type"
              field={fields.proportionerType}
              placeholder="Not recorded (the flow basis decides)"
              options={PROPORTIONER_TYPES.map((type) => ({
                value: type,
                label: `${PROPORTIONER_TYPE_LABELS[type]}: sets a ${PERCENT_OF_LABELS[PROPORTIONER_PERCENT_OF[type]]}`,
              }))}
              hint="Gives the report form its default for what a percentage setting is a share of."
            />
            <TextField
              label="Proportioner maximum concentrate rate (gpm)"
              field={fields.proportionerMaxConcentrateGpm}
              inputMode="decimal"
            />
            <TextField label="Water flow, minimum (gpm)" field={fields.waterFlowMinGpm} inputMode="decimal" />
            <TextField label="Water flow, maximum (gpm)" field={fields.waterFlowMaxGpm} inputMode="decimal" />
            <TextField
              label="Compressed-air capacity (cfm)"
              field={fields.compressedAirCfm}
              inputMode="decimal"
              hint="Leave empty without compressed-air foam."
            />
          </div>
        </section>
        <section className="card space-y-4" aria-labelledby="outlets-title">
          <h2 id="outlets-title" className="text-lg font-semibold">
            Outlets
          </h2>
          <p className="text-sm text-slate-ft">
            Defaults fill in a usage report line when the officer picks the outlet.
          </p>
          {outlets.length === 0 ? <p>No outlets.</p> : null}
          <ol className="space-y-4">
            {outlets.map((outlet, index) => {
              const item = outlet.getFieldset();
              return (
                <li key={outlet.key} className="rounded-md border border-stone-200 p-3">
                  <fieldset className="space-y-3">
                    <legend className="text-sm font-semibold">Outlet {index + 1}</legend>
                    <div className="grid gap-3 sm:grid-cols-2">
                      <TextField label="Name" field={item.name} hint="e.g. Crosslay 1" />
                      <TextField label="Default flow (gpm)" field={item.defaultFlowGpm} inputMode="decimal" />
                      <SelectField
                        label="The default flow measures"
                        field={item.defaultFlowBasis}
                        options={FLOW_BASES.map((basis) => ({ value: basis, label: FLOW_BASIS_LABELS[basis] }))}
                      />
                      <SelectField
                        label="Default method"
                        field={item.defaultMethod}
                        placeholder="None"
                        options={APPLICATION_METHODS.map((method) => ({
                          value: method,
                          label: APPLICATION_METHOD_LABELS[method],
                        }))}
                      />
                    </div>
                    <CheckboxField label="Foam-capable" field={item.foamCapable} />
                    <button className="btn-quiet" {...form.remove.getButtonProps({ name: fields.outlets.name, index })}>
                      Remove outlet {index + 1}
                    </button>
                  </fieldset>
                </li>
              );
            })}
          </ol>
          <button
            className="btn-secondary"
            {...form.insert.getButtonProps({
              name: fields.outlets.name,
              defaultValue: { name: "", foamCapable: "on", defaultFlowBasis: "water" },
            })}
          >
            Add an outlet
          </button>
        </section>
        <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
          {apparatus ? "Save apparatus" : "Add apparatus"}
        </button>
      </Form>
    </div>
  );
}
