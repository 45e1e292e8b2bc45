import { data } from "react-router";

/**
 * The one way a save says no, for reports, catalogue records and agency settings: a conflict
 * (someone else saved first: 409) or a refusal with its status (400 bad input, 403 not allowed,
 * 404 not there), a message for the top of the form and errors at fields.
 */
export type Refusal =
  | { kind: "conflict"; message: string; fieldErrors?: Record<string, string[]> }
  | { kind: "refused"; status: 400 | 403 | 404; message: string; fieldErrors?: Record<string, string[]> };

export const conflict = (message: string): Refusal => ({ kind: "conflict", message });

export const refused = (status: 400 | 403 | 404, message: string, fieldErrors?: Record<string, string[]>): Refusal => ({
  kind: "refused",
  status,
  message,
  ...(fieldErrors ? { fieldErrors } : {}),
});

/** Thrown inside a save's transaction to roll it back and answer with the refusal. */
export class RefusalError extends Error {
  constructor(readonly refusal: Refusal) {
    super(refusal.message);
  }
}

export function refusalStatus(refusal: Refusal): 400 | 403 | 404 | 409 {
  return refusal.kind === "conflict" ? 409 : refusal.status;
}

type Replying = {
  reply: (options: { formErrors?: string[]; fieldErrors?: Record<string, string[]> }) => unknown;
};

/**
 * An action's answer to a refused save: the form's conform reply with the message at the top and
 * errors at their fields (so the typing is kept), the refusal's status, and anything else the page needs.
 */
export function refusalData<Extra extends Record<string, unknown>>(
  submission: Replying,
  refusal: Refusal,
  extra?: Extra,
) {
  const result = submission.reply({ formErrors: [refusal.message], fieldErrors: refusal.fieldErrors });
  return data({ result, ...(extra ?? ({} as Extra)) }, { status: refusalStatus(refusal) });
}
