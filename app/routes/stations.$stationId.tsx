import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect } from "react-router";
import type { Route } from "./+types/stations.$stationId";
import { CheckboxField, FormErrors, TextField } from "~/components/form-fields";
import { requireCapability } from "~/lib/access.server";
import { StationFormSchema } from "~/lib/catalogue/apparatus-form";
import { formVersion, StaleRecordError, staleRecordMessage, submittedVersion } from "~/lib/catalogue/record-version";
import { recordIdOf } from "~/lib/record-id";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, httpError, invariantResponse } from "~/lib/http.server";
import { conflict, refusalData } from "~/lib/refusal";
import { flashHeaders } from "~/lib/session.server";
import { DuplicateCodeError, getStation, saveStation } from "~/models/apparatus.server";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.station ? `Station ${data.station.code}` : "New station"} · Foamtally` },
];

function stationIdOf(params: { stationId?: string }): number | null {
  if (params.stationId === "new") return null;
  const id = recordIdOf(params.stationId);
  if (id == null) httpError(404, "No such station.");
  return id;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "apparatus.edit");
  const id = stationIdOf(params);
  if (id == null) return { station: null };
  const station = await getStation(id);
  invariantResponse(station, "No such station.");
  return { station };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "apparatus.edit");
  const id = stationIdOf(params);
  const formData = await readFormData(request, StationFormSchema, { fields: ["version"] });
  const submission = parseWithZod(formData, { schema: StationFormSchema });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 400 });
  try {
    const saved = await saveStation(id, submittedVersion(formData), submission.value, user, clientAddress(request));
    invariantResponse(saved, "No such station.");
  } catch (error) {
    if (error instanceof StaleRecordError) {
      return refusalData(submission, conflict(staleRecordMessage("station")));
    }
    if (!(error instanceof DuplicateCodeError)) throw error;
    return data(
      { result: submission.reply({ fieldErrors: { code: ["Another station has this code."] } }) },
      { status: 400 },
    );
  }
  throw redirect("/apparatus", {
    headers: await flashHeaders(request, `Saved station ${submission.value.code}.`),
  });
}

export default function StationPage({ loaderData, actionData }: Route.ComponentProps) {
  const { station } = loaderData;
  const [form, fields] = useForm({
    id: "station",
    lastResult: actionData?.result,
    constraint: getZodConstraint(StationFormSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: StationFormSchema }),
    defaultValue: station
      ? {
          code: station.code,
          name: station.name,
          address: station.address,
          latitude: station.latitude?.toString(),
          longitude: station.longitude?.toString(),
          active: station.active ? "on" : undefined,
        }
      : { active: "on" },
  });
  return (
    <div className="max-w-xl space-y-6">
      <p>
        <Link to="/apparatus" className="text-pond-700 underline">
          ← Apparatus and stations
        </Link>
      </p>
      <h1 className="text-2xl font-bold">{station ? `Station ${station.code}` : "Add a station"}</h1>
      <Form method="post" className="card space-y-4" {...getFormProps(form)}>
        <FormErrors id={form.errorId} errors={form.errors} />
        {station ? (
          <input type="hidden" name="version" value={formVersion(actionData?.result, station.version)} />
        ) : null}
        <TextField label="Code" field={fields.code} hint="Short, e.g. S1." autoComplete="off" />
        <TextField label="Name" field={fields.name} autoComplete="off" />
        <TextField label="Address" field={fields.address} autoComplete="off" />
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Latitude" field={fields.latitude} inputMode="decimal" hint="Decimal degrees, WGS 84." />
          <TextField label="Longitude" field={fields.longitude} inputMode="decimal" hint="West is negative." />
        </div>
        <CheckboxField label="Open (in service)" field={fields.active} />
        <button type="submit" className="btn-primary">
          {station ? "Save station" : "Add station"}
        </button>
      </Form>
    </div>
  );
}
