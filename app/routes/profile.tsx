import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, redirect } from "react-router";
import type { Route } from "./+types/profile";
import { FormErrors, TextField } from "~/components/form-fields";
import { requireUser } from "~/lib/auth.server";
import { clientAddress } from "~/lib/http.server";
import { ROLE_LABELS } from "~/lib/roles";
import { commitSession, getSession } from "~/lib/session.server";
import { ChangePasswordSchema } from "~/lib/user-forms";
import { changePassword } from "~/models/user.server";

export const meta: Route.MetaFunction = () => [{ title: "Your profile · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { user: { name: user.name, email: user.email, roles: user.roles } };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const submission = parseWithZod(await request.formData(), { schema: ChangePasswordSchema });
  const hidden = ["currentPassword", "newPassword", "confirmPassword"];
  if (submission.status !== "success") {
    return data({ result: submission.reply({ hideFields: hidden }) }, { status: 400 });
  }
  const outcome = await changePassword(
    user,
    submission.value.currentPassword,
    submission.value.newPassword,
    clientAddress(request),
  );
  if (!outcome.ok) {
    return data(
      {
        result: submission.reply({
          fieldErrors: { currentPassword: ["The current password is incorrect."] },
          hideFields: hidden,
        }),
      },
      { status: 400 },
    );
  }
  const session = await getSession(request);
  session.set("epoch", outcome.epoch);
  session.flash("flash", "Your password was changed. Other sessions have been signed out.");
  throw redirect("/profile", { headers: { "Set-Cookie": await commitSession(session) } });
}

export default function Profile({ loaderData, actionData }: Route.ComponentProps) {
  const [form, fields] = useForm({
    id: "change-password",
    lastResult: actionData?.result,
    constraint: getZodConstraint(ChangePasswordSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: ChangePasswordSchema }),
  });
  return (
    <div className="grid gap-6 lg:grid-cols-2">
      <section className="card" aria-labelledby="profile-title">
        <h1 id="profile-title" className="text-2xl font-bold">
          Your profile
        </h1>
        <dl className="mt-4 space-y-2">
          <div>
            <dt className="text-sm font-semibold text-slate-ft">Name</dt>
            <dd>{loaderData.user.name}</dd>
          </div>
          <div>
            <dt className="text-sm font-semibold text-slate-ft">Email</dt>
            <dd>{loaderData.user.email}</dd>
          </div>
          <div>
            <dt className="text-sm font-semibold text-slate-ft">Roles</dt>
            <dd>{loaderData.user.roles.map((role) => ROLE_LABELS[role]).join(", ") || "none"}</dd>
          </div>
        </dl>
      </section>
      <section className="card" aria-labelledby="password-title">
        <h2 id="password-title" className="text-lg font-semibold">
          Change your password
        </h2>
        <Form method="post" className="mt-4 space-y-4" {...getFormProps(form)}>
          <FormErrors id={form.errorId} errors={form.errors} />
          <TextField
            label="Current password"
            field={fields.currentPassword}
            type="password"
            autoComplete="current-password"
          />
          <TextField
            label="New password"
            field={fields.newPassword}
            type="password"
            autoComplete="new-password"
            hint="At least 12 characters."
          />
          <TextField
            label="Repeat the new password"
            field={fields.confirmPassword}
            type="password"
            autoComplete="new-password"
          />
          <button type="submit" className="btn-primary">
            Change password
          </button>
        </Form>
      </section>
    </div>
  );
}
