import { type AccessDecision, type Capability, decide, type RecordFor } from "./access";
import { requireUser, type SessionUser } from "./auth.server";
import { apiError, httpError, isApiRequest } from "./http.server";

/**
 * Stops the request unless the decision allows it: 404 for a record the person may not see (so
 * neither it nor its version can be probed), 403 for one they may see but not use this way.
 */
function enforce(request: Request, decision: AccessDecision): void {
  if (decision === "allow") return;
  const api = isApiRequest(request);
  if (decision === "hidden") {
    if (api) apiError(404, "Not found.");
    httpError(404, "There is no such record.");
  }
  if (api) apiError(403, "Your roles do not allow this.");
  httpError(403, "Your roles do not allow you to use this page.");
}

/**
 * The guard that opens every loader and action: the signed-in person who may use `capability`
 * (on `record`, when given). Pages redirect to sign-in; `/api/*` answers 401/403/404 JSON.
 */
export async function requireCapability<C extends Capability>(
  request: Request,
  capability: C,
  record?: RecordFor<C>,
): Promise<SessionUser> {
  const user = await requireUser(request);
  enforce(request, decide(user, capability, record));
  return user;
}

/** The second step for a record loaded after the guard: the same decision, for a known person. */
export function authorize<C extends Capability>(
  request: Request,
  user: SessionUser,
  capability: C,
  record: RecordFor<C>,
): void {
  enforce(request, decide(user, capability, record));
}
