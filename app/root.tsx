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
import { securityMiddleware } from "./lib/security.server";
import { commitSession, getSession } from "./lib/session.server";
import stylesheet from "./app.css?url";

export const middleware: Route.MiddlewareFunction[] = [securityMiddleware];

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

const FRIENDLY: Record<number, { title: string; text: string }> = {
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

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  const root = useRouteLoaderData<typeof loader>("root");
  let status = 500;
  let message: string | undefined;
  if (isRouteErrorResponse(error)) {
    status = error.status;
    const body = error.data as { message?: unknown } | string | undefined;
    message = typeof body === "string" ? body : typeof body?.message === "string" ? body.message : undefined;
  }
  const friendly = FRIENDLY[status] ?? {
    title: "Something went wrong",
    text: "Foamtally hit an unexpected problem. Nothing you saved is lost; try again, and tell an administrator if it keeps happening.",
  };
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
