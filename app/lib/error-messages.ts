/** What a refused or failed request says to a person, by status: the error page and the download refusal alike. */
export const FRIENDLY_ERRORS: Record<number, { title: string; text: string }> = {
  400: { title: "That request could not be read", text: "Check what was entered and try again." },
  401: { title: "Please sign in", text: "Your session has ended. Sign in again to continue." },
  403: { title: "Not for your role", text: "Your roles do not allow this page. Ask an administrator if you need it." },
  404: { title: "Not found", text: "There is nothing at this address. It may have been moved or never existed." },
  409: { title: "Someone else changed this", text: "Reload to see the latest version." },
  411: { title: "That request could not be read", text: "Send it again with its length declared." },
  413: { title: "Too much to send", text: "The request is larger than Foamtally accepts. Nothing was saved." },
  415: { title: "That request could not be read", text: "Send the form from its page. Nothing was saved." },
  503: {
    title: "Temporarily unavailable",
    text: "A service Foamtally depends on is not answering. Try again in a minute.",
  },
};

export const UNEXPECTED_ERROR = {
  title: "Something went wrong",
  text: "Foamtally hit an unexpected problem. Nothing you saved is lost; try again, and tell an administrator if it keeps happening.",
};

export function friendlyError(status: number): { title: string; text: string } {
  return FRIENDLY_ERRORS[status] ?? UNEXPECTED_ERROR;
}
