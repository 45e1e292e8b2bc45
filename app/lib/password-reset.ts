/** How long a password-reset link works: one hour (common practice, no source). */
export const RESET_LINK_MINUTES = 60;

/** The one answer to every accepted reset request, whether or not the address belongs to an account. */
export const RESET_REQUESTED_MESSAGE = `If an active account uses that address, a link to set a new password is on its way. It works once, for ${RESET_LINK_MINUTES} minutes.`;
