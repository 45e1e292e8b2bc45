const PROBE_ORIGIN = "http://foamtally.invalid";

/**
 * Where to send someone after signing in: `target` only when it is a path on this site that parses
 * back to exactly itself, else `fallback`. Refuses other origins (`//evil.example`, `/\evil`), any
 * control or space character (tab, CR, LF, U+3000: browsers drop or fold them, and a header cannot
 * carry them), and anything the URL parser would rewrite (`/%2e%2e/`, non-ASCII), so what is
 * checked is what the browser follows.
 */
export function safeRedirectTo(target: string | null | undefined, fallback = "/"): string {
  if (!target || target.length > 2048) return fallback;
  if (!target.startsWith("/") || target.startsWith("//")) return fallback;
  if (/[\s\\\p{C}]/u.test(target)) return fallback;
  let parsed: URL;
  try {
    parsed = new URL(target, PROBE_ORIGIN);
  } catch {
    return fallback;
  }
  if (parsed.origin !== PROBE_ORIGIN) return fallback;
  return parsed.pathname + parsed.search + parsed.hash === target ? target : fallback;
}
