import { getFormProps, useForm, type SubmissionResult } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { data, Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/profile";
import { FormErrors, TextField } from "~/components/form-fields";
import { CreateApiTokenSchema, MAX_ACTIVE_TOKENS, RevokeApiTokenSchema } from "~/lib/api-token-form";
import { requireUser } from "~/lib/auth.server";
import { readFormData } from "~/lib/form-data.server";
import { clientAddress } from "~/lib/http.server";
import { ROLE_LABELS } from "~/lib/access";
import { currentSessionId, flashHeaders } from "~/lib/session.server";
import { ChangePasswordSchema } from "~/lib/user-forms";
import {
  createApiToken,
  listApiTokens,
  revokeApiToken,
  TooManyTokensError,
  type ApiTokenRow,
} from "~/models/api-token.server";
import { changePassword } from "~/models/user.server";

export const meta: Route.MetaFunction = () => [{ title: "Your profile · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { user: { name: user.name, email: user.email, roles: user.roles }, tokens: await listApiTokens(user.id) };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const formData = await readFormData(request, [CreateApiTokenSchema, RevokeApiTokenSchema, ChangePasswordSchema], {
    fields: ["intent"],
  });
  const intent = formData.get("intent");
  if (intent === "create-token") {
    const submission = parseWithZod(formData, { schema: CreateApiTokenSchema });
    if (submission.status !== "success") {
      return data({ intent, result: submission.reply(), newToken: null }, { status: 400 });
    }
    try {
      const created = await createApiToken(user, submission.value.name, clientAddress(request));
      // The secret goes back in this one response only; it is never stored or put in a cookie.
      return data({
        intent,
        result: submission.reply({ resetForm: true }),
        newToken: { id: created.id, name: submission.value.name, token: created.token },
      });
    } catch (error) {
      if (!(error instanceof TooManyTokensError)) throw error;
      return data(
        {
          intent,
          result: submission.reply({
            formErrors: [`You already have ${MAX_ACTIVE_TOKENS} active tokens; revoke one you no longer use.`],
          }),
          newToken: null,
        },
        { status: 400 },
      );
    }
  }
  if (intent === "revoke-token") {
    const submission = parseWithZod(formData, { schema: RevokeApiTokenSchema });
    const revoked =
      submission.status === "success" && (await revokeApiToken(user, submission.value.tokenId, clientAddress(request)));
    if (!revoked) {
      return data(
        { intent, result: submission.reply({ formErrors: ["No such active token of yours."] }), newToken: null },
        { status: 404 },
      );
    }
    throw redirect("/profile", {
      headers: await flashHeaders(request, "The token was revoked; it stopped working at once."),
    });
  }
  const submission = parseWithZod(formData, { schema: ChangePasswordSchema });
  const hidden = ["currentPassword", "newPassword", "confirmPassword"];
  if (submission.status !== "success") {
    return data(
      { intent: "password", result: submission.reply({ hideFields: hidden }), newToken: null },
      { status: 400 },
    );
  }
  const outcome = await changePassword(user, submission.value.currentPassword, submission.value.newPassword, {
    clientAddress: clientAddress(request),
    keepSessionId: await currentSessionId(request),
  });
  if (!outcome.ok) {
    return data(
      {
        intent: "password",
        result: submission.reply({
          fieldErrors: { currentPassword: ["The current password is incorrect."] },
          hideFields: hidden,
        }),
        newToken: null,
      },
      { status: 400 },
    );
  }
  throw redirect("/profile", {
    headers: await flashHeaders(request, "Your password was changed. Your other sessions have been signed out."),
  });
}

export default function Profile({ loaderData, actionData }: Route.ComponentProps) {
  const [form, fields] = useForm({
    id: "change-password",
    lastResult: actionData?.intent === "password" ? actionData.result : undefined,
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
            hint="At least 12 characters, not a common password; a few unrelated words work well."
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
      <ApiTokens
        tokens={loaderData.tokens}
        result={
          actionData?.intent === "create-token" || actionData?.intent === "revoke-token" ? actionData.result : undefined
        }
        newToken={actionData?.newToken ?? null}
      />
    </div>
  );
}

const when = (value: string | null) =>
  value
    ? `${new Date(value).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short", timeZone: "UTC" })} UTC`
    : "never";

function ApiTokens({
  tokens,
  result,
  newToken,
}: {
  tokens: ApiTokenRow[];
  result: SubmissionResult<string[]> | undefined;
  newToken: { id: number; name: string; token: string } | null;
}) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "create-token",
    lastResult: result,
    constraint: getZodConstraint(CreateApiTokenSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: CreateApiTokenSchema }),
  });
  return (
    <section className="card lg:col-span-2" aria-labelledby="tokens-title">
      <h2 id="tokens-title" className="text-lg font-semibold">
        Personal API tokens
      </h2>
      <p className="mt-1 text-sm text-slate-ft">
        For your department&apos;s own scripts: send <code>Authorization: Bearer &lt;token&gt;</code> to any{" "}
        <code>/api/</code> address. A token acts with your roles; revoke it when the script is retired or the token may
        have leaked.
      </p>
      {newToken ? (
        <div role="status" className="caution mt-4">
          <p className="font-semibold">Copy the token “{newToken.name}” now: it is shown only this once.</p>
          <label htmlFor="new-token" className="sr-only">
            New token
          </label>
          <input
            id="new-token"
            readOnly
            value={newToken.token}
            className="field-input font-mono text-sm"
            onFocus={(event) => event.currentTarget.select()}
          />
        </div>
      ) : null}
      <Form method="post" className="mt-4 flex flex-wrap items-end gap-3" {...getFormProps(form)}>
        <input type="hidden" name="intent" value="create-token" />
        <div className="min-w-64 flex-1">
          <TextField
            label="Token name"
            field={fields.name}
            autoComplete="off"
            hint="What will use it, e.g. station dashboard."
          />
        </div>
        <button type="submit" className="btn-primary" disabled={navigation.state === "submitting"}>
          Create token
        </button>
        <div className="w-full">
          <FormErrors id={form.errorId} errors={form.errors} />
        </div>
      </Form>
      {tokens.length === 0 ? (
        <p className="mt-4">You have no tokens.</p>
      ) : (
        <div className="mt-4 overflow-x-auto">
          <table className="data-table">
            <thead>
              <tr>
                <th scope="col">Name</th>
                <th scope="col">Starts with</th>
                <th scope="col">Created</th>
                <th scope="col">Last used</th>
                <th scope="col">
                  <span className="sr-only">Revoke</span>
                </th>
              </tr>
            </thead>
            <tbody>
              {tokens.map((token) => (
                <tr key={token.id}>
                  <td>{token.name}</td>
                  <td>
                    <code>{token.prefix}…</code>
                  </td>
                  <td>{when(token.createdAt)}</td>
                  <td>{when(token.lastUsedAt)}</td>
                  <td>
                    {token.revokedAt ? (
                      <span className="text-sm text-slate-ft">Revoked {when(token.revokedAt)}</span>
                    ) : (
                      <Form method="post">
                        <input type="hidden" name="intent" value="revoke-token" />
                        <input type="hidden" name="tokenId" value={token.id} />
                        <button type="submit" className="btn-secondary">
                          Revoke<span className="sr-only"> {token.name}</span>
                        </button>
                      </Form>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
