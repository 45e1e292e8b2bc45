import { action as signInAction } from "~/routes/sign-in";
import { cookieFrom, formRequest, routeArgs, settle } from "./requests";

/** Signs in through the real sign-in action and returns the session cookie. */
export async function signIn(email: string, password: string, address = "10.0.0.1"): Promise<string> {
  const request = formRequest("/sign-in", { email, password }, { "x-foamtally-client-address": address });
  const outcome = await settle(() => signInAction(routeArgs(request)));
  if (!(outcome.value instanceof Response) || outcome.value.status !== 302) {
    throw new Error(`sign-in failed for ${email}`);
  }
  return cookieFrom(outcome.value);
}
