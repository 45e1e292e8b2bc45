import { ZxcvbnFactory } from "@zxcvbn-ts/core";
import * as common from "@zxcvbn-ts/language-common";

/**
 * What makes a new password acceptable, the same in the browser and on the server.
 * - At least 12 characters: NIST SP 800-63B rev. 4 asks for at least 15 for a single factor and
 *   allows 8 with other factors (from memory); 12 is this product's choice for shared station
 *   computers, common practice, no source.
 * - At most 72 bytes of UTF-8: bcrypt reads no further (decision 022), so a longer one is refused
 *   rather than silently shortened.
 * - Not one character repeated, and not easy to guess: zxcvbn's estimate (the common-password,
 *   name and word lists of @zxcvbn-ts/language-common) must reach score 3, "safely unguessable",
 *   as zxcvbn's authors recommend for passwords (from memory).
 */
export const MIN_PASSWORD_CHARACTERS = 12;
export const MAX_PASSWORD_BYTES = 72;
export const MIN_PASSWORD_SCORE = 3;

let factory: ZxcvbnFactory | undefined;

function strength(password: string): number {
  factory ??= new ZxcvbnFactory({
    dictionary: { ...common.dictionary },
    graphs: common.adjacencyGraphs,
  });
  return factory.check(password).score;
}

export function passwordBytes(password: string): number {
  return new TextEncoder().encode(password).length;
}

/** The first thing wrong with a new password, as the field says it, or null when it will do. */
export function passwordProblem(password: string): string | null {
  if ([...password].length < MIN_PASSWORD_CHARACTERS) return `Use at least ${MIN_PASSWORD_CHARACTERS} characters.`;
  if (passwordBytes(password) > MAX_PASSWORD_BYTES) {
    return `A password has at most ${MAX_PASSWORD_BYTES} bytes (72 plain letters, fewer with accents or symbols).`;
  }
  if (/^(.)\1*$/su.test(password)) return "One character repeated is too easy to guess.";
  if (strength(password) < MIN_PASSWORD_SCORE) {
    return "This password is common or follows an easy pattern. Try three or four unrelated words.";
  }
  return null;
}
