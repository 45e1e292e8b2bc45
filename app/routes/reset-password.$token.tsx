import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/reset-password.$token";
import { FormErrors, TextField } from "~/components/form-fields";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress } from "~/lib/http.server";
import { flashHeaders } from "~/lib/session.server";
import { ResetPasswordSchema } from "~/lib/user-forms";
import { resetLinkAccount, resetPassword } from "~/models/password-reset.server";

export const meta: Route.MetaFunction = () => [{ title: "Set a new password · Foamtally" }];

const LINK_SPENT = "This link has expired or has been used. Ask for a new one.";

// Public: the link itself is the permission (ROUTE_ACCESS "public").
export async function loader({ params }: Route.LoaderArgs) {
  const account = await resetLinkAccount(params.token ?? "");
  return data({ email: account?.email ?? null }, { status: account ? 200 : 410 });
}

export async function action({ request, params }: Route.ActionArgs) {
  const formData = await readFormData(request, ResetPasswordSchema);
  const submission = parseWithZod(formData, { schema: ResetPasswordSchema });
  const hidden = ["newPassword", "confirmPassword"];
  if (submission.status !== "success") {
    return data({ result: submission.reply({ hideFields: hidden }) }, { status: 400 });
  }
  const outcome = await resetPassword(params.token ?? "", submission.value.newPassword, clientAddress(request));
  if (!outcome.ok) {
    return data({ result: submission.reply({ formErrors: [LINK_SPENT], hideFields: hidden }) }, { status: 410 });
  }
  throw redirect("/sign-in", {
    headers: await flashHeaders(request, "Your new password is set. Sign in with it; other sessions were ended."),
  });
}

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "reset-password",
    lastResult: actionData?.result,
    constraint: getZodConstraint(ResetPasswordSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ResetPasswordSchema }),
  });
  return (
    <section className="mx-auto max-w-md" aria-labelledby="reset-title">
      <div className="card">
        <h1 id="reset-title" className="text-2xl font-bold">
          Set a new password
        </h1>
        {loaderData.email ? (
          <>
            <p className="mt-1 text-sm text-slate-ft">
              For {loaderData.email}. At least 12 characters, hard to guess: three or four unrelated words work well.
            </p>
            <Form method="post" className="mt-6 space-y-4" {...getFormProps(form)}>
              <FormErrors id={form.errorId} errors={form.errors} />
              <TextField label="New password" field={fields.newPassword} type="password" autoComplete="new-password" />
              <TextField
                label="Repeat the new password"
                field={fields.confirmPassword}
                type="password"
                autoComplete="new-password"
              />
              <button type="submit" className="btn-primary w-full" disabled={navigation.state === "submitting"}>
                Set the password
              </button>
            </Form>
          </>
        ) : (
          <p className="caution mt-4" role="alert">
            {LINK_SPENT}{" "}
            <Link to="/forgot-password" className="underline">
              Ask for a new link
            </Link>
            .
          </p>
        )}
      </div>
    </section>
  );
}
