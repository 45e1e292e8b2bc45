import type { MiddlewareFunction } from "react-router";
import stylesheet from "../app.css?url";
import { friendlyError } from "./error-messages";
import { isApiRequest } from "./http.server";

/**
 * Whether a refusal should be answered as a page: a browser opening a download or file (a link
 * followed, an address typed) that is not under `/api/`, where a resource route's refusal would
 * otherwise show as raw JSON. Scripts and `/api/*` keep their JSON; so do the app's own data requests.
 */
export function wantsRefusalPage(request: Request, response: Response): boolean {
  if (response.status < 400 || response.status === 401) return false;
  if (isApiRequest(request)) return false;
  const url = new URL(request.url);
  if (url.pathname.endsWith(".data")) return false;
  if (!(response.headers.get("Content-Type") ?? "").includes("application/json")) return false;
  const navigation = request.headers.get("Sec-Fetch-Mode") === "navigate";
  const acceptsPage = (request.headers.get("Accept") ?? "").includes("text/html");
  return navigation || acceptsPage;
}

const escapeHtml = (text: string) => text.replace(/[&<>"']/g, (character) => `&#${character.charCodeAt(0)};`);

/** The refusal as a small page in the app's own styles, with the server's reason when it gave one. */
export function refusalPage(status: number, message: string | undefined): string {
  const friendly = friendlyError(status);
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(friendly.title)} · Foamtally</title>
<link rel="stylesheet" href="${stylesheet}">
<link rel="icon" href="/favicon.svg" type="image/svg+xml">
</head>
<body class="min-h-screen bg-stone-50 font-sans text-ink">
<main class="mx-auto max-w-5xl p-4">
<section class="card mx-auto max-w-xl" aria-labelledby="error-title">
<p class="text-sm font-semibold text-ember-700">Error ${status}</p>
<h1 id="error-title" class="mt-1 text-2xl font-bold">${escapeHtml(friendly.title)}</h1>
<p class="mt-3">${escapeHtml(message ?? friendly.text)}</p>
<p class="mt-4"><a class="btn-secondary" href="/">Go to your home page</a></p>
</section>
</main>
</body>
</html>
`;
}

/** Answers a browser's refused download with a page of the same status instead of JSON. */
export const refusedDownloadMiddleware: MiddlewareFunction<Response> = async ({ request }, next) => {
  const response = await next();
  if (!wantsRefusalPage(request, response)) return response;
  const body = (await response
    .clone()
    .json()
    .catch(() => null)) as { message?: unknown; error?: unknown } | null;
  const message =
    typeof body?.message === "string" ? body.message : typeof body?.error === "string" ? body.error : undefined;
  const headers = new Headers(response.headers);
  headers.set("Content-Type", "text/html; charset=utf-8");
  headers.delete("Content-Length");
  headers.delete("Content-Disposition");
  return new Response(refusalPage(response.status, message), { status: response.status, headers });
};
