import { RouterContextProvider } from "react-router";

const ORIGIN = "http://127.0.0.1:3000";

export function formRequest(
  path: string,
  fields: Record<string, string | string[]>,
  headers: HeadersInit = {},
): Request {
  const body = new URLSearchParams();
  for (const [key, value] of Object.entries(fields)) {
    for (const item of Array.isArray(value) ? value : [value]) body.append(key, item);
  }
  return new Request(`${ORIGIN}${path}`, {
    method: "POST",
    body,
    headers: { "Content-Type": "application/x-www-form-urlencoded", Origin: ORIGIN, ...headers },
  });
}

export function getRequest(path: string, headers: HeadersInit = {}): Request {
  return new Request(`${ORIGIN}${path}`, { headers });
}

export function jsonRequest(path: string, body: unknown, headers: HeadersInit = {}): Request {
  return new Request(`${ORIGIN}${path}`, {
    method: "POST",
    body: JSON.stringify(body),
    headers: { "Content-Type": "application/json", Origin: ORIGIN, ...headers },
  });
}

export function routeArgs(request: Request, params: Record<string, string> = {}) {
  return { request, params, context: new RouterContextProvider(), unstable_pattern: "" } as never;
}

/** The Set-Cookie of a response, as the Cookie header of the next request. */
export function cookieFrom(response: Response): string {
  const header = response.headers.get("Set-Cookie");
  if (!header) throw new Error("response set no cookie");
  return header.split(";")[0];
}

/** Runs a loader or action and returns what it threw or returned as a Response-like result. */
export async function settle<T>(run: () => Promise<T>): Promise<{ thrown: boolean; value: unknown }> {
  try {
    return { thrown: false, value: await run() };
  } catch (value) {
    return { thrown: true, value };
  }
}
