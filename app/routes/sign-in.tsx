import { getFormProps, useForm } from "@conform-to/react";
import { getZodConstraint, parseWithZod } from "@conform-to/zod/v4";
import { useEffect } from "react";
import { data, Form, Link, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/sign-in";
import { FormErrors, TextField } from "~/components/form-fields";
import { authenticator, getUser, safeRedirectTo, SignInError } from "~/lib/auth.server";
import { readFormData, requestWithForm } from "~/lib/form-data.server";
import { DATABASE_DOWN_MESSAGE, isDatabaseDown } from "~/lib/http.server";
import { startSession } from "~/lib/session.server";
import { SignInFormSchema } from "~/lib/sign-in-form";

/** A throttled attempt's Retry-After reaches the page's response, not only a data request's. */
export const headers: Route.HeadersFunction = ({ actionHeaders }) => {
  const retryAfter = actionHeaders.get("Retry-After");
  return retryAfter ? { "Retry-After": retryAfter } : new Headers();
};

export const meta: Route.MetaFunction = () => [{ title: "Sign in · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  const redirectTo = safeRedirectTo(new URL(request.url).searchParams.get("redirectTo"));
  if (user) throw redirect(redirectTo);
  return { redirectTo };
}

export async function action({ request }: Route.ActionArgs) {
  const formData = await readFormData(request, SignInFormSchema);
  const submission = parseWithZod(formData, { schema: SignInFormSchema });
  if (submission.status !== "success") {
    return data({ result: submission.reply({ hideFields: ["password"] }) }, { status: 400 });
  }
  try {
    const user = await authenticator.authenticate("form", requestWithForm(request, formData));
    throw redirect(safeRedirectTo(submission.value.redirectTo), {
      headers: { "Set-Cookie": await startSession(request, user.id) },
    });
  } catch (error) {
    if (error instanceof Response) throw error;
    if (!(error instanceof SignInError) && !isDatabaseDown(error)) throw error;
    const message = error instanceof SignInError ? error.message : DATABASE_DOWN_MESSAGE;
    const status = error instanceof SignInError ? error.status : 503;
    const retryAfter = error instanceof SignInError ? error.retryAfterSeconds : null;
    return data(
      { result: submission.reply({ formErrors: [message], hideFields: ["password"] }) },
      { status, headers: retryAfter ? { "Retry-After": String(retryAfter) } : undefined },
    );
  }
}

export default function SignIn({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    id: "sign-in",
    lastResult: actionData?.result,
    constraint: getZodConstraint(SignInFormSchema),
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: SignInFormSchema }),
  });
  // The server's answer to the last attempt stays until the next one is answered: checking the
  // fields as they lose focus must not take it away, or the button would move under the pointer
  // between pressing and releasing it and the click would be lost.
  const refusal = actionData?.result?.error?.[""] ?? null;
  const formErrors = form.errors?.length ? form.errors : refusal;
  // After a refused attempt the email stays and the password is cleared, as people expect.
  useEffect(() => {
    const password = actionData ? document.getElementById(fields.password.id) : null;
    if (password instanceof HTMLInputElement) password.value = "";
  }, [actionData, fields.password.id]);
  return (
    <section className="mx-auto max-w-md" aria-labelledby="sign-in-title">
      <div className="card">
        <h1 id="sign-in-title" className="text-2xl font-bold">
          Sign in to Foamtally
        </h1>
        <p className="mt-1 text-sm text-slate-ft">Foam-usage records for your department.</p>
        <Form method="post" className="mt-6 space-y-4" {...getFormProps(form)}>
          <FormErrors id={form.errorId} errors={formErrors} />
          <input type="hidden" name="redirectTo" value={loaderData.redirectTo} />
          <TextField label="Email" field={fields.email} type="email" autoComplete="username" autoFocus />
          <TextField label="Password" field={fields.password} type="password" autoComplete="current-password" />
          <button type="submit" className="btn-primary w-full" disabled={navigation.state === "submitting"}>
            {navigation.state === "submitting" ? "Signing in…" : "Sign in"}
          </button>
        </Form>
        <p className="mt-4 text-sm">
          <Link to="/forgot-password" className="text-pond-700 underline">
            Forgot your password?
          </Link>
        </p>
      </div>
    </section>
  );
}
