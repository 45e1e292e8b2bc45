import { getFormProps, getInputProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/products.$productId";
import { EarlierFiles } from "~/components/earlier-files";
import { CheckboxField, ErrorList, FormErrors, SelectField, TextAreaField, TextField } from "~/components/form-fields";
import { requireCapability } from "~/lib/access.server";
import { sniffBytes } from "~/lib/attachment-content.server";
import { ProductFormSchema, SAFETY_SHEET_MAX_BYTES } from "~/lib/catalogue/product-form";
import { formVersion, StaleRecordError, staleRecordMessage, submittedVersion } from "~/lib/catalogue/record-version";
import { FOAM_TYPE_LABELS, FOAM_TYPES, PFAS_CONTENT_UNIT_LABELS, PFAS_CONTENT_UNITS } from "~/lib/foam/vocabulary";
import { recordIdOf } from "~/lib/record-id";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress, httpError, invariantResponse } from "~/lib/http.server";
import { can } from "~/lib/access";
import { UPLOAD_BODY_MAX_BYTES } from "~/lib/request-limits";
import { conflict, refusalData } from "~/lib/refusal";
import { flashHeaders } from "~/lib/session.server";
import { StorageUnavailableError } from "~/lib/storage.server";
import { earlierVersions } from "~/models/file-versions.server";
import { DuplicateProductNameError, getProduct, saveProduct, type SafetySheetUpload } from "~/models/product.server";

export const meta: Route.MetaFunction = ({ data }) => [
  { title: `${data?.product ? data.product.name : "New foam product"} · Foamtally` },
];

function productIdOf(params: { productId?: string }): number | null {
  if (params.productId === "new") return null;
  const id = recordIdOf(params.productId);
  if (id == null) httpError(404, "No such product.");
  return id;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "catalogue.read");
  const id = productIdOf(params);
  const canEdit = can(user, "catalogue.edit");
  if (id == null) {
    invariantResponse(canEdit, "Only an environmental officer adds foam products.", 403);
    return { product: null, canEdit, earlierSheets: [] };
  }
  const product = await getProduct(id);
  invariantResponse(product, "No such product.");
  return { product, canEdit, earlierSheets: await earlierVersions("safety_sheet", String(id)) };
}

export async function action({ request, params }: Route.ActionArgs) {
  const user = await requireCapability(request, "catalogue.edit");
  const id = productIdOf(params);
  // Refuse an oversized upload before reading it into memory (the form's other fields are small).
  const declared = Number(request.headers.get("Content-Length") ?? 0);
  if (declared > SAFETY_SHEET_MAX_BYTES + 256 * 1024) {
    return data(
      {
        result: {
          status: "error" as const,
          error: { safetySheet: [`A safety sheet is at most ${SAFETY_SHEET_MAX_BYTES / 1024 / 1024} MB.`] },
        },
      },
      { status: 413 },
    );
  }
  const formData = await readFormData(request, ProductFormSchema, {
    fields: ["version"],
    maxBytes: UPLOAD_BODY_MAX_BYTES,
  });
  const submission = parseWithZod(formData, { schema: ProductFormSchema });
  if (submission.status !== "success") {
    return data({ result: submission.reply() }, { status: 400 });
  }
  let sheet: SafetySheetUpload | null = null;
  const file = submission.value.safetySheet;
  if (file) {
    const body = new Uint8Array(await file.arrayBuffer());
    // By content, as every attachment is: a renamed file is not a PDF.
    if ((await sniffBytes(body)).type !== "application/pdf") {
      return data(
        { result: submission.reply({ fieldErrors: { safetySheet: ["This file is not a PDF document."] } }) },
        { status: 400 },
      );
    }
    sheet = { name: file.name.slice(0, 255), contentType: "application/pdf", body };
  }
  let savedId: number | null;
  try {
    savedId = await saveProduct(id, submittedVersion(formData), submission.value, sheet, user, clientAddress(request));
  } catch (error) {
    if (error instanceof StaleRecordError) {
      return refusalData(submission, conflict(staleRecordMessage("product")));
    }
    if (error instanceof DuplicateProductNameError) {
      return data(
        { result: submission.reply({ fieldErrors: { name: ["Another product already has this name."] } }) },
        { status: 400 },
      );
    }
    if (error instanceof StorageUnavailableError) {
      return data(
        {
          result: submission.reply({
            fieldErrors: {
              safetySheet: ["The file store is not answering, so nothing was saved. Try again in a minute."],
            },
          }),
        },
        { status: 503 },
      );
    }
    throw error;
  }
  invariantResponse(savedId, "No such product.");
  throw redirect("/products", {
    headers: await flashHeaders(request, `Saved ${submission.value.name}.`),
  });
}

export default function ProductPage({ loaderData, actionData }: Route.ComponentProps) {
  const { product, canEdit } = loaderData;
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "product",
    lastResult: actionData?.result,
    constraint: getZodConstraint(ProductFormSchema),
    shouldValidate: "onBlur",
    shouldRevalidate: "onInput",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ProductFormSchema }),
    defaultValue: product
      ? {
          name: product.name,
          maker: product.maker,
          foamClass: product.foamClass,
          foamType: product.foamType,
          nominalPercents: product.nominalPercents.join(", "),
          pfasContaining: product.pfasContaining ? "on" : undefined,
          pfasContent: product.pfasContent?.toString(),
          pfasContentUnit: product.pfasContentUnit ?? undefined,
          pfoaContent: product.pfoaContent?.toString(),
          pfoaContentUnit: product.pfoaContentUnit ?? undefined,
          pfosContent: product.pfosContent?.toString(),
          pfosContentUnit: product.pfosContentUnit ?? undefined,
          pfasContentBasis: product.pfasContentBasis ?? undefined,
          pfasContentSource: product.pfasContentSource ?? undefined,
          unitCostPerGal: product.unitCostPerGal?.toString(),
          active: product.active ? "on" : undefined,
          heldForDisposal: product.heldForDisposal ? "on" : undefined,
          shelfLifeMonths: product.shelfLifeMonths?.toString(),
          notes: product.notes ?? undefined,
        }
      : { active: "on", foamClass: "B" },
  });
  const readOnly = !canEdit;
  const sheetProps = getInputProps(fields.safetySheet, { type: "file" });
  return (
    <div className="max-w-3xl space-y-6">
      <p>
        <Link to="/products" className="text-pond-700 underline">
          ← All foam products
        </Link>
      </p>
      <h1 className="text-2xl font-bold">{product ? product.name : "Add a foam product"}</h1>
      <div className="caution" role="note" aria-label="PFAS handling caution">
        <p className="font-semibold">Handling PFAS-containing foam</p>
        <p>
          Legacy AFFF and other fluorinated concentrates contain PFAS, which persist in soil and water. Keep them out of
          drains, ditches and waterways; contain and collect runoff; store held stock sealed and labelled; dispose of it
          only through a licensed route. Many states restrict their use; a release at or above a reportable quantity
          must be reported immediately (CERCLA §103, EPCRA §304), and this record is not that notice. Local codes,
          permits and your licensed advisers govern; the PFAS content you enter is only as good as its source — say
          whether it is measured or estimated.
        </p>
      </div>
      <Form method="post" encType="multipart/form-data" className="card space-y-4" {...getFormProps(form)}>
        <FormErrors id={form.errorId} errors={form.errors} />
        {product ? (
          <input type="hidden" name="version" value={formVersion(actionData?.result, product.version)} />
        ) : null}
        <fieldset disabled={readOnly} className="space-y-4">
          <TextField label="Name" field={fields.name} autoComplete="off" />
          <TextField label="Maker" field={fields.maker} autoComplete="off" />
          <div className="grid gap-4 sm:grid-cols-2">
            <SelectField
              label="Foam class"
              field={fields.foamClass}
              options={[
                { value: "A", label: "Class A (ordinary combustibles)" },
                { value: "B", label: "Class B (flammable liquids)" },
              ]}
            />
            <SelectField
              label="Type"
              field={fields.foamType}
              placeholder="Choose a type"
              options={FOAM_TYPES.map((type) => ({ value: type, label: FOAM_TYPE_LABELS[type] }))}
            />
          </div>
          <TextField
            label="Nominal percentages"
            field={fields.nominalPercents}
            hint="The percentages the product is rated at, separated by commas, e.g. 3, 6 or 0.1, 0.3, 0.5, 1."
            autoComplete="off"
          />
          <TextField
            label="Unit cost per gallon (US $)"
            field={fields.unitCostPerGal}
            inputMode="decimal"
            autoComplete="off"
          />
          <fieldset className="space-y-3 rounded-md border border-stone-200 p-3">
            <legend className="px-1 text-sm font-semibold">PFAS</legend>
            <CheckboxField label="Contains PFAS (fluorinated)" field={fields.pfasContaining} />
            <div className="grid gap-4 sm:grid-cols-2">
              <TextField label="PFAS content" field={fields.pfasContent} inputMode="decimal" autoComplete="off" />
              <SelectField
                label="Unit of the PFAS content"
                field={fields.pfasContentUnit}
                placeholder="Choose a unit"
                options={PFAS_CONTENT_UNITS.map((unit) => ({ value: unit, label: PFAS_CONTENT_UNIT_LABELS[unit] }))}
              />
            </div>
            <p className="text-sm text-slate-ft">
              Total PFAS is a screening figure. The federal reportable quantity counts PFOA and PFOS, each on its own
              (40 CFR 302.4): leave a figure empty when it is not known, and every report of this product answers
              &ldquo;unknown&rdquo; to whether the quantity was reached (40 CFR 302.6(b)(1)(ii)).
            </p>
            <div className="grid gap-4 sm:grid-cols-2">
              <TextField label="PFOA content" field={fields.pfoaContent} inputMode="decimal" autoComplete="off" />
              <SelectField
                label="Unit of the PFOA content"
                field={fields.pfoaContentUnit}
                placeholder="Choose a unit"
                options={PFAS_CONTENT_UNITS.map((unit) => ({ value: unit, label: PFAS_CONTENT_UNIT_LABELS[unit] }))}
              />
              <TextField label="PFOS content" field={fields.pfosContent} inputMode="decimal" autoComplete="off" />
              <SelectField
                label="Unit of the PFOS content"
                field={fields.pfosContentUnit}
                placeholder="Choose a unit"
                options={PFAS_CONTENT_UNITS.map((unit) => ({ value: unit, label: PFAS_CONTENT_UNIT_LABELS[unit] }))}
              />
            </div>
            <TextAreaField
              label="Basis of the PFAS figure"
              field={fields.pfasContentBasis}
              hint="What the figure measures (total PFAS, PFOS only…) and whether it is measured or estimated."
            />
            <TextAreaField
              label="Source of the PFAS figure"
              field={fields.pfasContentSource}
              hint="Safety sheet, laboratory report (with its number), or the estimate's reasoning."
            />
          </fieldset>
          <div>
            <label htmlFor={fields.safetySheet.id} className="field-label">
              Safety sheet (PDF, at most {SAFETY_SHEET_MAX_BYTES / 1024 / 1024} MB)
            </label>
            {product?.hasSafetySheet ? (
              <p className="text-sm">
                Current:{" "}
                <a href={`/products/${product.id}/safety-sheet`} className="text-pond-700 underline">
                  {product.safetySheetName}
                </a>
                {readOnly ? null : " — choose a file to replace it; the current one is kept as an earlier sheet."}
              </p>
            ) : null}
            {product ? (
              <EarlierFiles
                versions={loaderData.earlierSheets}
                hrefOf={(version) => `/products/${product.id}/safety-sheet/versions/${version.id}`}
                label="Earlier safety sheets"
              />
            ) : null}
            <input {...sheetProps} key={sheetProps.key} accept="application/pdf,.pdf" className="field-input" />
            <ErrorList id={fields.safetySheet.errorId} errors={fields.safetySheet.errors} />
          </div>
          <TextAreaField label="Notes" field={fields.notes} />
          <CheckboxField
            label="Active (officers can choose it on a usage report)"
            field={fields.active}
            hint="Untick to retire a product; past reports keep it."
          />
          <CheckboxField
            label="Held for disposal (legacy PFAS foam)"
            field={fields.heldForDisposal}
            hint="In stock it can only be sent for disposal; a report that uses it must say why."
          />
          <TextField
            label="Shelf life (months from manufacture)"
            field={fields.shelfLifeMonths}
            inputMode="numeric"
            autoComplete="off"
            hint="From the product's data sheet; a lot older than this is flagged in the stock book."
          />
        </fieldset>
        {readOnly ? (
          <p className="text-sm text-slate-ft">Only an environmental officer changes foam products.</p>
        ) : (
          <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
            {product ? "Save changes" : "Add product"}
          </button>
        )}
      </Form>
    </div>
  );
}
