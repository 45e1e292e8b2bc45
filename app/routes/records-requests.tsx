import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/records-requests";
import { FormErrors, TextAreaField, TextField } from "~/components/form-fields";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress } from "~/lib/http.server";
import { consumeRecordsRequestAllowance } from "~/lib/rate-limit.server";
import { DESCRIPTION_MAX, RecordsRequestSchema } from "~/lib/records/request-form";
import { createRecordsRequest } from "~/models/records-request.server";
import { deliverPendingMailSoon } from "~/models/mail-outbox.server";

export const meta: Route.MetaFunction = () => [{ title: "Ask for public records · Foamtally" }];

// Public: anyone may ask, without an account (ROUTE_ACCESS "public").
export async function loader() {
  return null;
}

function wantsJson(request: Request): boolean {
  return (request.headers.get("Accept") ?? "").includes("application/json");
}

export async function action({ request }: Route.ActionArgs) {
  const json = wantsJson(request);
  const waitSeconds = await consumeRecordsRequestAllowance(clientAddress(request));
  if (waitSeconds > 0) {
    const message = `Too many requests from your address. Please try again in ${Math.ceil(waitSeconds / 60)} minutes.`;
    const headers = { "Retry-After": String(waitSeconds) };
    if (json) return Response.json({ error: message }, { status: 429, headers });
    return data({ result: null, message }, { status: 429, headers });
  }
  const formData = await readFormData(request, RecordsRequestSchema);
  const submission = parseWithZod(formData, { schema: RecordsRequestSchema });
  if (submission.status !== "success") {
    if (json) return Response.json({ errors: submission.error ?? {} }, { status: 400 });
    return data({ result: submission.reply(), message: null }, { status: 400 });
  }
  if (submission.value.website) {
    // The hidden field was filled: not a person. Nothing is stored and nothing is said about why.
    if (json) return Response.json({ errors: { "": ["The request could not be accepted."] } }, { status: 400 });
    return data(
      { result: submission.reply({ formErrors: ["The request could not be accepted."] }), message: null },
      { status: 400 },
    );
  }
  const { trackingCode } = await createRecordsRequest(submission.value);
  deliverPendingMailSoon();
  if (json) return Response.json({ trackingCode }, { status: 201 });
  throw redirect(`/records-requests/${trackingCode}?received=1`);
}

export default function RecordsRequestIntake({ actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "records-request",
    lastResult: actionData?.result,
    constraint: getZodConstraint(RecordsRequestSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: RecordsRequestSchema }),
  });
  return (
    <section className="mx-auto max-w-2xl" aria-labelledby="records-request-title">
      <div className="card">
        <h1 id="records-request-title" className="text-2xl font-bold">
          Ask for public records
        </h1>
        <p className="mt-1 text-sm text-slate-ft">
          Ask the fire department for records of foam use. No account is needed. You will get a tracking code and an
          e-mail, and the date by which an answer is due.
        </p>
        {actionData?.message ? (
          <p role="alert" className="mt-4 rounded border border-red-300 bg-red-50 p-3 text-sm text-red-800">
            {actionData.message}
          </p>
        ) : null}
        <Form method="post" className="mt-6 space-y-4" {...getFormProps(form)}>
          <FormErrors id={form.errorId} errors={form.errors} />
          <TextField label="Your name" field={fields.name} autoComplete="name" />
          <TextField label="E-mail" field={fields.email} type="email" autoComplete="email" />
          <TextField label="Phone (optional)" field={fields.phone} autoComplete="tel" />
          <TextField label="Organisation (optional)" field={fields.organisation} autoComplete="organization" />
          <TextAreaField
            label="Which records do you ask for?"
            field={fields.description}
            rows={6}
            hint={`At most ${DESCRIPTION_MAX.toLocaleString("en-US")} characters.`}
          />
          <fieldset className="grid gap-4 sm:grid-cols-2">
            <legend className="mb-1 font-medium">Dates (optional)</legend>
            <TextField label="From" field={fields.from} type="date" />
            <TextField label="To" field={fields.to} type="date" />
          </fieldset>
          <fieldset className="space-y-4">
            <legend className="mb-1 font-medium">Place (optional)</legend>
            <TextField label="An address in the district" field={fields.address} autoComplete="street-address" />
            <div className="grid gap-4 sm:grid-cols-2">
              <TextField label="Or a point: latitude" field={fields.lat} inputMode="decimal" />
              <TextField label="Longitude" field={fields.lon} inputMode="decimal" />
            </div>
          </fieldset>
          <div className="hidden" aria-hidden="true">
            <label>
              Leave this empty
              <input type="text" name="website" tabIndex={-1} autoComplete="off" />
            </label>
          </div>
          <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
            {navigation.state === "submitting" ? "Sending…" : "Send the request"}
          </button>
        </Form>
      </div>
    </section>
  );
}
