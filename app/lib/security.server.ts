import type { MiddlewareFunction } from "react-router";
import { env } from "./env.server";

/** One year, the value HSTS preload lists ask for (hstspreload.org requirements, from memory). */
export const HSTS_VALUE = "max-age=31536000; includeSubDomains";

/** Only this origin; map workers run from blob: URLs. */
export function contentSecurityPolicy(nonce?: string): string {
  const scripts = nonce ? `'self' 'nonce-${nonce}'` : "'self'";
  return [
    "default-src 'self'",
    `script-src ${scripts}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "worker-src 'self' blob:",
    "child-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * A state-changing request whose Origin (or, failing that, Referer) names another site.
 * Requests with neither header (scripts using an API token) are not cross-site browser requests.
 */
export function isForeignOrigin(method: string, url: string, headers: { origin?: string; referer?: string }): boolean {
  if (SAFE_METHODS.has(method.toUpperCase())) return false;
  const claimed = headers.origin || headers.referer;
  if (!claimed) return false;
  if (claimed === "null") return true;
  try {
    return new URL(claimed).host !== new URL(url).host;
  } catch {
    return true;
  }
}

export function securityHeaderRecord(https = env().HTTPS): Record<string, string> {
  return {
    ...(https ? { "Strict-Transport-Security": HSTS_VALUE } : {}),
    "Content-Security-Policy": contentSecurityPolicy(),
    "X-Content-Type-Options": "nosniff",
    "X-Frame-Options": "DENY",
    "Referrer-Policy": "same-origin",
    "Permissions-Policy": "camera=(), microphone=(), geolocation=(self)",
    "Cross-Origin-Opener-Policy": "same-origin",
  };
}

/**
 * Root middleware: refuses foreign-origin writes and adds the security headers to every response.
 * An answer that does not say how it may be cached gets `Cache-Control: no-store`: pages and API
 * answers carry people's names and report data, which no browser or proxy cache should keep. Static
 * assets are served before the app and keep their own caching; tiles set theirs.
 */
export const securityMiddleware: MiddlewareFunction<Response> = async ({ request }, next) => {
  const headers = { origin: request.headers.get("Origin") ?? "", referer: request.headers.get("Referer") ?? "" };
  if (isForeignOrigin(request.method, request.url, headers)) {
    return Response.json(
      { error: "This request came from another site and was refused." },
      { status: 403, headers: securityHeaderRecord() },
    );
  }
  const response = await next();
  for (const [name, value] of Object.entries(securityHeaderRecord())) {
    if (name === "Content-Security-Policy" && response.headers.has(name)) continue;
    response.headers.set(name, value);
  }
  if (!response.headers.has("Cache-Control")) response.headers.set("Cache-Control", "no-store");
  return response;
};
