import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/admin.users";
import { ErrorList, FormErrors, TextField } from "~/components/form-fields";
import { requireUser } from "~/lib/auth.server";
import { clientAddress } from "~/lib/http.server";
import { ROLE_LABELS, ROLES, type Role } from "~/lib/roles";
import { flashHeaders } from "~/lib/session.server";
import { CreateUserSchema, UpdateUserSchema } from "~/lib/user-forms";
import { createUser, DuplicateEmailError, listUsers, updateUser, type UserRow } from "~/models/user.server";

const MANAGERS: Role[] = ["admin", "chief"];

export const meta: Route.MetaFunction = () => [{ title: "People and roles · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, MANAGERS);
  return { users: await listUsers(), selfId: user.id };
}

export async function action({ request }: Route.ActionArgs) {
  const actor = await requireUser(request, MANAGERS);
  const formData = await request.formData();
  const intent = formData.get("intent");
  if (intent === "create") {
    const submission = parseWithZod(formData, { schema: CreateUserSchema });
    if (submission.status !== "success") {
      return data({ intent, result: submission.reply({ hideFields: ["password"] }) }, { status: 400 });
    }
    try {
      await createUser(submission.value, actor, clientAddress(request));
    } catch (error) {
      if (!(error instanceof DuplicateEmailError)) throw error;
      return data(
        {
          intent,
          result: submission.reply({
            fieldErrors: { email: ["Someone already has an account with this email."] },
            hideFields: ["password"],
          }),
        },
        { status: 400 },
      );
    }
    throw redirect("/admin/users", {
      headers: await flashHeaders(request, `Account created for ${submission.value.email}.`),
    });
  }
  const submission = parseWithZod(formData, { schema: UpdateUserSchema });
  if (submission.status !== "success") {
    return data({ intent: "update", result: submission.reply() }, { status: 400 });
  }
  const { userId, name, roles, active } = submission.value;
  if (userId === actor.id && (!active || !roles.some((role) => MANAGERS.includes(role)))) {
    return data(
      {
        intent: "update",
        result: submission.reply({ formErrors: ["You cannot remove your own access to this page."] }),
      },
      { status: 400 },
    );
  }
  const found = await updateUser(userId, { name, roles, active }, actor, clientAddress(request));
  if (!found)
    return data({ intent: "update", result: submission.reply({ formErrors: ["No such person."] }) }, { status: 404 });
  throw redirect("/admin/users", { headers: await flashHeaders(request, `Saved changes for ${name}.`) });
}

export default function AdminUsers({ loaderData, actionData }: Route.ComponentProps) {
  const [form, fields] = useForm({
    id: "create-user",
    lastResult: actionData?.intent === "create" ? actionData.result : undefined,
    constraint: getZodConstraint(CreateUserSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: CreateUserSchema }),
  });
  const updateErrors = actionData?.intent === "update" ? actionData.result.error?.[""] : undefined;
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">People and roles</h1>
      <section className="card overflow-x-auto" aria-labelledby="people-title">
        <h2 id="people-title" className="text-lg font-semibold">
          Accounts
        </h2>
        <FormErrors errors={updateErrors ?? undefined} />
        <table className="data-table mt-3">
          <thead>
            <tr>
              <th scope="col">Person</th>
              <th scope="col">Roles</th>
              <th scope="col">Active</th>
              <th scope="col">
                <span className="sr-only">Save</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {loaderData.users.map((user) => (
              <UserRowForm key={user.id} user={user} />
            ))}
          </tbody>
        </table>
      </section>
      <section className="card max-w-xl" aria-labelledby="create-title">
        <h2 id="create-title" className="text-lg font-semibold">
          Add a person
        </h2>
        <p className="text-sm text-slate-ft">
          Give them the temporary password in person; they change it on their profile.
        </p>
        <Form method="post" className="mt-4 space-y-4" {...getFormProps(form)}>
          <input type="hidden" name="intent" value="create" />
          <FormErrors id={form.errorId} errors={form.errors} />
          <TextField label="Name" field={fields.name} autoComplete="off" />
          <TextField label="Email" field={fields.email} type="email" autoComplete="off" />
          <TextField
            label="Temporary password"
            field={fields.password}
            type="password"
            autoComplete="new-password"
            hint="At least 12 characters."
          />
          <fieldset>
            <legend className="field-label">Roles</legend>
            <div className="mt-1 flex flex-wrap gap-3">
              {ROLES.map((role) => (
                <label key={role} className="flex min-h-11 items-center gap-2">
                  <input type="checkbox" name={fields.roles.name} value={role} className="h-5 w-5" />
                  {ROLE_LABELS[role]}
                </label>
              ))}
            </div>
            <ErrorList id={fields.roles.errorId} errors={fields.roles.errors} />
          </fieldset>
          <button type="submit" className="btn-primary">
            Create account
          </button>
        </Form>
      </section>
    </div>
  );
}

function UserRowForm({ user }: { user: UserRow }) {
  const navigation = useNavigation();
  const formId = `user-${user.id}`;
  return (
    <tr>
      <td>
        <Form method="post" id={formId}>
          <input type="hidden" name="intent" value="update" />
          <input type="hidden" name="userId" value={user.id} />
        </Form>
        <label className="sr-only" htmlFor={`${formId}-name`}>
          Name of {user.email}
        </label>
        <input
          id={`${formId}-name`}
          form={formId}
          name="name"
          defaultValue={user.name}
          className="field-input mt-0"
          required
          maxLength={120}
        />
        <span className="text-xs text-slate-ft">{user.email}</span>
      </td>
      <td>
        <fieldset>
          <legend className="sr-only">Roles of {user.email}</legend>
          <div className="flex flex-wrap gap-x-3">
            {ROLES.map((role) => (
              <label key={role} className="flex min-h-11 items-center gap-1 text-sm">
                <input
                  form={formId}
                  type="checkbox"
                  name="roles"
                  value={role}
                  defaultChecked={user.roles.includes(role)}
                  className="h-5 w-5"
                />
                {ROLE_LABELS[role]}
              </label>
            ))}
          </div>
        </fieldset>
      </td>
      <td>
        <label className="flex min-h-11 items-center gap-2 text-sm">
          <input form={formId} type="checkbox" name="active" defaultChecked={user.active} className="h-5 w-5" />
          Active
        </label>
      </td>
      <td>
        <button form={formId} type="submit" className="btn-secondary" disabled={navigation.state === "submitting"}>
          Save<span className="sr-only"> {user.email}</span>
        </button>
      </td>
    </tr>
  );
}
