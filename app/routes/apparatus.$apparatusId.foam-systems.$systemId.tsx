import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/apparatus.$apparatusId.foam-systems.$systemId";
import { CheckboxField, FormErrors, SelectField, TextField } from "~/components/form-fields";
import { requireCapability } from "~/lib/access.server";
import { formVersion, submittedVersion } from "~/lib/catalogue/record-version";
import { FoamSystemFormSchema } from "~/lib/foam/system-forms";
import {
  FOAM_SYSTEM_PERCENT_OF,
  FOAM_SYSTEM_TYPE_LABELS,
  FOAM_SYSTEM_TYPES,
  PERCENT_OF,
  PERCENT_OF_LABELS,
} from "~/lib/foam/vocabulary";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, invariantResponse, requireRecordId } from "~/lib/http.server";
import { refusalData } from "~/lib/refusal";
import { flashHeaders } from "~/lib/session.server";
import { getApparatus } from "~/models/apparatus.server";
import { listActiveProducts } from "~/models/catalogue.server";
import { getFoamSystem, saveFoamSystem } from "~/models/foam-system.server";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.system ? data.system.name : "New foam system"} · ${data?.apparatus.unitId ?? ""} · Foamtally` },
];

function systemIdOf(request: Request, params: { systemId?: string }): number | null {
  if (params.systemId === "new") return null;
  return requireRecordId(request, params.systemId, "No such foam system.");
}

export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "apparatus.edit");
  const apparatusId = requireRecordId(request, params.apparatusId, "No such apparatus.");
  const systemId = systemIdOf(request, params);
  const [apparatus, products] = await Promise.all([getApparatus(apparatusId), listActiveProducts()]);
  invariantResponse(apparatus, "No such apparatus.");
  const system = systemId == null ? null : await getFoamSystem(systemId);
  if (systemId != null) invariantResponse(system && system.apparatusId === apparatusId, "No such foam system.");
  return {
    apparatus: { id: apparatus.id, unitId: apparatus.unitId, outlets: apparatus.outlets.map((outlet) => outlet.name) },
    system,
    products: products.map((product) => ({ value: String(product.id), label: product.name })),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "apparatus.edit");
  const apparatusId = requireRecordId(request, params.apparatusId, "No such apparatus.");
  const systemId = systemIdOf(request, params);
  const formData = await readFormData(request, FoamSystemFormSchema, { fields: ["version"] });
  const submission = parseWithZod(formData, { schema: FoamSystemFormSchema });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 400 });
  const saved = await saveFoamSystem(
    apparatusId,
    systemId,
    submittedVersion(formData),
    submission.value,
    user,
    clientAddress(request),
  );
  if ("kind" in saved) return refusalData(submission, saved);
  throw redirect(`/foam-systems/${saved.id}`, {
    headers: await flashHeaders(request, `Saved ${submission.value.name}.`),
  });
}

export default function FoamSystemEditPage({ loaderData, actionData }: Route.ComponentProps) {
  const { apparatus, system, products } = loaderData;
  const navigation = useNavigation();
  const tank = system?.tanks[0];
  const [form, fields] = useForm({
    id: "foam-system",
    lastResult: actionData?.result,
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: FoamSystemFormSchema }),
    defaultValue: system
      ? {
          name: system.name,
          systemType: system.type,
          percentOf: system.percentOf,
          minConcentrateGpm: system.minConcentrateGpm?.toString(),
          maxConcentrateGpm: system.maxConcentrateGpm?.toString(),
          waterFlowMinGpm: system.waterFlowMinGpm?.toString(),
          waterFlowMaxGpm: system.waterFlowMaxGpm?.toString(),
          tankName: tank?.name,
          tankCapacityGal: tank?.capacityGal?.toString(),
          tankProductId: tank?.productId?.toString(),
          outlets: system.outlets.join(", "),
          active: system.active ? "on" : undefined,
        }
      : { systemType: "direct_injection", percentOf: FOAM_SYSTEM_PERCENT_OF.direct_injection, active: "on" },
  });
  return (
    <div className="max-w-3xl space-y-6">
      <p>
        <Link to={`/apparatus/${apparatus.id}`} className="text-pond-700 underline">
          ← Apparatus {apparatus.unitId}
        </Link>
      </p>
      <h1 className="text-2xl font-bold">
        {system ? `${apparatus.unitId} · ${system.name}` : `Add a foam system to ${apparatus.unitId}`}
      </h1>
      <Form method="post" className="card space-y-4" {...getFormProps(form)}>
        <FormErrors id={form.errorId} errors={form.errors} />
        {system ? <input type="hidden" name="version" value={formVersion(actionData?.result, system.version)} /> : null}
        <TextField label="Name" field={fields.name} hint="e.g. Class A direct injection, Class B around-the-pump." />
        <div className="grid gap-4 sm:grid-cols-2">
          <SelectField
            label="Kind of system"
            field={fields.systemType}
            options={FOAM_SYSTEM_TYPES.map((type) => ({ value: type, label: FOAM_SYSTEM_TYPE_LABELS[type] }))}
          />
          <SelectField
            label="The controller's percentage is"
            field={fields.percentOf}
            options={PERCENT_OF.map((value) => ({ value, label: PERCENT_OF_LABELS[value] }))}
            hint="Direct-injection controllers usually set a share of the water (common practice, no source)."
          />
          <TextField label="Minimum concentrate rate (gpm)" field={fields.minConcentrateGpm} inputMode="decimal" />
          <TextField label="Maximum concentrate rate (gpm)" field={fields.maxConcentrateGpm} inputMode="decimal" />
          <TextField label="Water flow, lowest (gpm)" field={fields.waterFlowMinGpm} inputMode="decimal" />
          <TextField label="Water flow, highest (gpm)" field={fields.waterFlowMaxGpm} inputMode="decimal" />
          <TextField label="Concentrate tank" field={fields.tankName} hint="e.g. Tank A." />
          <TextField label="Tank capacity (gal)" field={fields.tankCapacityGal} inputMode="decimal" />
          <SelectField label="Product loaded" field={fields.tankProductId} placeholder="—" options={products} />
        </div>
        <TextField
          label="Outlets served"
          field={fields.outlets}
          hint={`Comma-separated, from ${apparatus.unitId}'s outlets: ${apparatus.outlets.join(", ") || "none yet"}. A usage line on one of them is placed on this system.`}
        />
        <CheckboxField label="In service" field={fields.active} />
        <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
          {system ? "Save the system" : "Add the system"}
        </button>
      </Form>
    </div>
  );
}
