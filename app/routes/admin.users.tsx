import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/admin.users";
import { ErrorList, FormErrors, TextField } from "~/components/form-fields";
import { ADMINISTRATOR, can, ROLE_LABELS, ROLES, type Role } from "~/lib/access";
import { authorize, requireCapability } from "~/lib/access.server";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress } from "~/lib/http.server";
import { RESET_LINK_MINUTES } from "~/lib/password-reset";
import { flashHeaders } from "~/lib/session.server";
import { CreateUserSchema, EndSessionsSchema, SendResetLinkSchema, UpdateUserSchema } from "~/lib/user-forms";
import { listStationOptions, type StationOption } from "~/models/catalogue.server";
import { sendPasswordResetLink } from "~/models/password-reset.server";
import {
  accountRecord,
  createUser,
  DuplicateEmailError,
  endUserSessions,
  listUsers,
  updateUser,
  type UserRow,
} from "~/models/user.server";

const GRANT_ADMIN_REFUSED = "Only an administrator can give or take away the administrator role.";
const UNKNOWN_STATION = "Choose a station from the list.";

export const meta: Route.MetaFunction = () => [{ title: "People and roles · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireCapability(request, "users.manage");
  const [users, stations] = await Promise.all([listUsers(), listStationOptions()]);
  return {
    users: users.map((person) => ({ ...person, editable: can(user, "users.manage", person) })),
    stations,
    selfId: user.id,
    canGrantAdmin: can(user, "users.grant-admin"),
  };
}

export async function action({ request }: Route.ActionArgs) {
  const actor = await requireCapability(request, "users.manage");
  const formData = await readFormData(request, [
    CreateUserSchema,
    UpdateUserSchema,
    EndSessionsSchema,
    SendResetLinkSchema,
  ]);
  const stationIds = new Set((await listStationOptions()).map((station) => station.id));
  const intent = formData.get("intent");
  if (intent === "create") {
    const submission = parseWithZod(formData, { schema: CreateUserSchema });
    if (submission.status !== "success") {
      return data({ intent, result: submission.reply({ hideFields: ["password"] }) }, { status: 400 });
    }
    const refusal: Record<string, string[]> | null = !can(actor, "users.manage", submission.value)
      ? { roles: [GRANT_ADMIN_REFUSED] }
      : submission.value.stationId !== null && !stationIds.has(submission.value.stationId)
        ? { stationId: [UNKNOWN_STATION] }
        : null;
    if (refusal) {
      return data(
        { intent, result: submission.reply({ fieldErrors: refusal, hideFields: ["password"] }) },
        { status: refusal.roles ? 403 : 400 },
      );
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
  if (intent === "send-reset") {
    const submission = parseWithZod(formData, { schema: SendResetLinkSchema });
    const target = submission.status === "success" ? await accountRecord(submission.value.userId) : null;
    if (submission.status !== "success" || !target) {
      return data({ intent: "update", result: submission.reply({ formErrors: ["No such person."] }) }, { status: 404 });
    }
    authorize(request, actor, "users.manage", target);
    const sent = await sendPasswordResetLink(submission.value.userId, actor, clientAddress(request));
    if (!sent) {
      return data(
        {
          intent: "update",
          result: submission.reply({ formErrors: ["This account is not active: no link was sent."] }),
        },
        { status: 400 },
      );
    }
    throw redirect("/admin/users", {
      headers: await flashHeaders(
        request,
        `A reset link is on its way (through the outbox). It works once, for ${RESET_LINK_MINUTES} minutes; earlier links stopped working.`,
      ),
    });
  }
  if (intent === "end-sessions") {
    const submission = parseWithZod(formData, { schema: EndSessionsSchema });
    const target = submission.status === "success" ? await accountRecord(submission.value.userId) : null;
    if (submission.status !== "success" || !target) {
      return data({ intent: "update", result: submission.reply({ formErrors: ["No such person."] }) }, { status: 404 });
    }
    authorize(request, actor, "users.manage", target);
    const outcome = await endUserSessions(submission.value.userId, actor, clientAddress(request));
    if (!outcome.found) {
      return data({ intent: "update", result: submission.reply({ formErrors: ["No such person."] }) }, { status: 404 });
    }
    const ended = `${outcome.ended} session${outcome.ended === 1 ? "" : "s"}`;
    const self = submission.value.userId === actor.id;
    throw redirect(self ? "/sign-in" : "/admin/users", {
      headers: await flashHeaders(request, `Ended ${ended}; a copied sign-in no longer works anywhere.`),
    });
  }
  const submission = parseWithZod(formData, { schema: UpdateUserSchema });
  if (submission.status !== "success") {
    return data({ intent: "update", result: submission.reply() }, { status: 400 });
  }
  const { userId, name, roles, active, stationId } = submission.value;
  const target = await accountRecord(userId);
  if (!target) {
    return data({ intent: "update", result: submission.reply({ formErrors: ["No such person."] }) }, { status: 404 });
  }
  authorize(request, actor, "users.manage", target);
  const adminChanged = target.roles.includes(ADMINISTRATOR) !== roles.includes(ADMINISTRATOR);
  if (adminChanged && !can(actor, "users.grant-admin")) {
    return data({ intent: "update", result: submission.reply({ formErrors: [GRANT_ADMIN_REFUSED] }) }, { status: 403 });
  }
  if (stationId !== null && !stationIds.has(stationId)) {
    return data({ intent: "update", result: submission.reply({ formErrors: [UNKNOWN_STATION] }) }, { status: 400 });
  }
  if (userId === actor.id && (!active || !can({ ...actor, roles }, "users.manage"))) {
    return data(
      {
        intent: "update",
        result: submission.reply({ formErrors: ["You cannot remove your own access to this page."] }),
      },
      { status: 400 },
    );
  }
  const found = await updateUser(userId, { name, roles, active, stationId }, actor, clientAddress(request));
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
  const { stations, canGrantAdmin } = loaderData;
  const grantable = ROLES.filter((role) => role !== ADMINISTRATOR || canGrantAdmin);
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">People and roles</h1>
      <section className="card overflow-x-auto" aria-labelledby="people-title">
        <h2 id="people-title" className="text-lg font-semibold">
          Accounts
        </h2>
        <FormErrors errors={updateErrors ?? undefined} />
        <div className="table-scroll mt-3">
          <table className="data-table">
            <thead>
              <tr>
                <th scope="col">Person</th>
                <th scope="col">Roles</th>
                <th scope="col">Station</th>
                <th scope="col">Active</th>
                <th scope="col">Signed in</th>
                <th scope="col">
                  <span className="sr-only">Save</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {loaderData.users.map((user) =>
                user.editable ? (
                  <UserRowForm key={user.id} user={user} roles={grantable} stations={stations} />
                ) : (
                  <ReadOnlyUserRow key={user.id} user={user} stations={stations} />
                ),
              )}
            </tbody>
          </table>
        </div>
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
            hint="At least 12 characters, not a common password; a few unrelated words work well."
          />
          <fieldset>
            <legend className="field-label">Roles</legend>
            <div className="mt-1 flex flex-wrap gap-3">
              {grantable.map((role) => (
                <label key={role} className="flex min-h-11 items-center gap-2">
                  <input type="checkbox" name={fields.roles.name} value={role} className="h-5 w-5" />
                  {ROLE_LABELS[role]}
                </label>
              ))}
            </div>
            <ErrorList id={fields.roles.errorId} errors={fields.roles.errors} />
          </fieldset>
          <div>
            <label htmlFor={fields.stationId.id} className="field-label">
              Station
            </label>
            <select id={fields.stationId.id} name={fields.stationId.name} defaultValue="" className="field-input">
              <option value="">No station</option>
              {stations.map((station) => (
                <option key={station.id} value={station.id}>
                  {station.code} {station.name}
                </option>
              ))}
            </select>
            <p className="text-sm text-slate-ft">
              A company officer fixes returned reports and revises accepted reports of their own station.
            </p>
            <ErrorList id={fields.stationId.errorId} errors={fields.stationId.errors} />
          </div>
          <button type="submit" className="btn-primary">
            Create account
          </button>
        </Form>
      </section>
    </div>
  );
}

function stationLabel(stations: StationOption[], id: number | null): string {
  const station = stations.find((candidate) => candidate.id === id);
  return station ? `${station.code} ${station.name}` : "none";
}

function sessionsLabel(count: number): string {
  return count === 0 ? "No sessions" : `${count} session${count === 1 ? "" : "s"}`;
}

/** An account this person may not change (an administrator, for someone who is not one). */
function ReadOnlyUserRow({ user, stations }: { user: UserRow; stations: StationOption[] }) {
  return (
    <tr>
      <td>
        {user.name}
        <span className="block text-xs text-slate-ft">{user.email}</span>
      </td>
      <td>{user.roles.map((role) => ROLE_LABELS[role]).join(", ")}</td>
      <td>{stationLabel(stations, user.stationId)}</td>
      <td>{user.active ? "Active" : "Inactive"}</td>
      <td>{sessionsLabel(user.sessions)}</td>
      <td className="text-sm text-slate-ft">Only an administrator changes this account.</td>
    </tr>
  );
}

function UserRowForm({ user, roles, stations }: { user: UserRow; roles: readonly Role[]; stations: StationOption[] }) {
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
            {roles.map((role) => (
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
        <label className="sr-only" htmlFor={`${formId}-station`}>
          Station of {user.email}
        </label>
        <select
          id={`${formId}-station`}
          form={formId}
          name="stationId"
          defaultValue={user.stationId ?? ""}
          className="field-input mt-0"
        >
          <option value="">No station</option>
          {stations.map((station) => (
            <option key={station.id} value={station.id}>
              {station.code}
            </option>
          ))}
        </select>
      </td>
      <td>
        <label className="flex min-h-11 items-center gap-2 text-sm">
          <input form={formId} type="checkbox" name="active" defaultChecked={user.active} className="h-5 w-5" />
          Active
        </label>
      </td>
      <td>
        <span className="text-sm">{sessionsLabel(user.sessions)}</span>
        {user.sessions > 0 ? (
          <Form method="post">
            <input type="hidden" name="intent" value="end-sessions" />
            <input type="hidden" name="userId" value={user.id} />
            <button type="submit" className="btn-secondary mt-1" disabled={navigation.state === "submitting"}>
              End sessions<span className="sr-only"> of {user.email}</span>
            </button>
          </Form>
        ) : null}
        {user.active ? (
          <Form method="post">
            <input type="hidden" name="intent" value="send-reset" />
            <input type="hidden" name="userId" value={user.id} />
            <button type="submit" className="btn-secondary mt-1" disabled={navigation.state === "submitting"}>
              Send reset link<span className="sr-only"> to {user.email}</span>
            </button>
          </Form>
        ) : null}
      </td>
      <td>
        <button form={formId} type="submit" className="btn-secondary" disabled={navigation.state === "submitting"}>
          Save<span className="sr-only"> {user.email}</span>
        </button>
      </td>
    </tr>
  );
}
