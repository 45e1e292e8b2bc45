import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, useNavigation } from "react-router";
import type { Route } from "./+types/forgot-password";
import { FormErrors, TextField } from "~/components/form-fields";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress } from "~/lib/http.server";
import { consumePasswordResetAllowance } from "~/lib/rate-limit.server";
import { RequestPasswordResetSchema } from "~/lib/user-forms";
import { RESET_REQUESTED_MESSAGE } from "~/lib/password-reset";
import { requestPasswordReset } from "~/models/password-reset.server";

export const meta: Route.MetaFunction = () => [{ title: "Forgot your password? · Foamtally" }];

// Public: someone who cannot sign in asks here (ROUTE_ACCESS "public").
export async function loader() {
  return null;
}

export async function action({ request }: Route.ActionArgs) {
  const formData = await readFormData(request, RequestPasswordResetSchema);
  const submission = parseWithZod(formData, { schema: RequestPasswordResetSchema });
  if (submission.status !== "success") return data({ result: submission.reply(), sent: false }, { status: 400 });
  const address = clientAddress(request);
  const allowance = await consumePasswordResetAllowance(address, submission.value.email);
  if (allowance.waitSeconds > 0) {
    const message = `Too many requests from your address. Please try again in ${Math.ceil(allowance.waitSeconds / 60)} minutes.`;
    return data(
      { result: submission.reply({ formErrors: [message] }), sent: false },
      { status: 429, headers: { "Retry-After": String(allowance.waitSeconds) } },
    );
  }
  if (allowance.mayMail) await requestPasswordReset(submission.value.email, address);
  return data({ result: submission.reply({ resetForm: true }), sent: true });
}

export default function ForgotPassword({ actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "forgot-password",
    lastResult: actionData?.result,
    constraint: getZodConstraint(RequestPasswordResetSchema),
    shouldValidate: "onSubmit",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: RequestPasswordResetSchema }),
  });
  return (
    <section className="mx-auto max-w-md" aria-labelledby="forgot-title">
      <div className="card">
        <h1 id="forgot-title" className="text-2xl font-bold">
          Forgot your password?
        </h1>
        <p className="mt-1 text-sm text-slate-ft">
          Enter the e-mail address you sign in with. We send a link to set a new password.
        </p>
        {actionData?.sent ? (
          <p role="status" className="mt-4 rounded-md bg-stone-100 p-3">
            {RESET_REQUESTED_MESSAGE}
          </p>
        ) : null}
        <Form method="post" className="mt-6 space-y-4" {...getFormProps(form)}>
          <FormErrors id={form.errorId} errors={form.errors} />
          <TextField label="Email" field={fields.email} type="email" autoComplete="username" autoFocus />
          <button type="submit" className="btn-primary w-full" disabled={navigation.state === "submitting"}>
            Send the link
          </button>
        </Form>
        <p className="mt-4 text-sm">
          <Link to="/sign-in" className="text-pond-700 underline">
            Back to sign in
          </Link>
        </p>
      </div>
    </section>
  );
}
