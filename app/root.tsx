import {
  data,
  isRouteErrorResponse,
  Links,
  Meta,
  Outlet,
  Scripts,
  ScrollRestoration,
  useRouteLoaderData,
} from "react-router";
import type { Route } from "./+types/root";
import { AppShell } from "./components/app-shell";
import { useNonce } from "./components/nonce";
import { getUser } from "./lib/auth.server";
import { publicEnv } from "./lib/env.server";
import { friendlyError } from "./lib/error-messages";
import { refusedDownloadMiddleware } from "./lib/refused-download.server";
import { securityMiddleware } from "./lib/security.server";
import { commitSession, getSession } from "./lib/session.server";
import stylesheet from "./app.css?url";

export const middleware: Route.MiddlewareFunction[] = [securityMiddleware, refusedDownloadMiddleware];

export const links: Route.LinksFunction = () => [
  { rel: "stylesheet", href: stylesheet },
  { rel: "icon", href: "/favicon.svg", type: "image/svg+xml" },
];

export const meta: Route.MetaFunction = () => [{ title: "Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await getUser(request);
  const session = await getSession(request);
  const flash = session.get("flash") ?? null;
  return data(
    {
      user: user && { id: user.id, name: user.name, email: user.email, roles: user.roles },
      flash,
      env: publicEnv(),
    },
    flash ? { headers: { "Set-Cookie": await commitSession(session) } } : undefined,
  );
}

export function Layout({ children }: { children: React.ReactNode }) {
  const nonce = useNonce();
  return (
    <html lang="en">
      <head>
        <meta charSet="utf-8" />
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <Meta />
        <Links />
      </head>
      <body className="min-h-screen font-sans">
        {children}
        <ScrollRestoration nonce={nonce} />
        <Scripts nonce={nonce} />
      </body>
    </html>
  );
}

export default function App({ loaderData }: Route.ComponentProps) {
  return (
    <AppShell user={loaderData.user} flash={loaderData.flash} demoMode={loaderData.env.DEMO_MODE}>
      <Outlet />
    </AppShell>
  );
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  const root = useRouteLoaderData<typeof loader>("root");
  let status = 500;
  let message: string | undefined;
  if (isRouteErrorResponse(error)) {
    status = error.status;
    const body = error.data as { message?: unknown } | string | undefined;
    message = typeof body === "string" ? body : typeof body?.message === "string" ? body.message : undefined;
  }
  const friendly = friendlyError(status);
  const details = import.meta.env.DEV && error instanceof Error ? error.stack : undefined;
  return (
    <AppShell user={root?.user ?? null} flash={null} demoMode={root?.env.DEMO_MODE ?? false}>
      <section className="card mx-auto max-w-xl" aria-labelledby="error-title">
        <p className="text-sm font-semibold text-ember-700">Error {status}</p>
        <h1 id="error-title" className="mt-1 text-2xl font-bold">
          {friendly.title}
        </h1>
        <p className="mt-3">{message ?? friendly.text}</p>
        <p className="mt-4">
          <a className="btn-secondary" href="/">
            Go to your home page
          </a>
        </p>
        {details ? <pre className="mt-4 overflow-auto text-xs">{details}</pre> : null}
      </section>
    </AppShell>
  );
}
