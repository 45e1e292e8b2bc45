import { Form, Link, NavLink, useLocation } from "react-router";
import { ROLE_LABELS, type Role } from "~/lib/access";
import { clearAllUnsavedCopies, SIGNING_OUT_EVENT } from "~/lib/unsaved-copy";
import { currentNavItem, navFor } from "./navigation";

/** Signing out leaves no one's unsaved report typing on this device for the next person. */
function forgetUnsavedCopies() {
  try {
    clearAllUnsavedCopies(window.localStorage);
    window.dispatchEvent(new Event(SIGNING_OUT_EVENT));
  } catch {
    // Storage turned off: nothing was kept.
  }
}

type ShellUser = { id: number; name: string; email: string; roles: Role[] } | null;

export function AppShell({
  user,
  flash,
  demoMode,
  children,
}: {
  user: ShellUser;
  flash: string | null;
  demoMode: boolean;
  children: React.ReactNode;
}) {
  const items = user ? navFor(user.roles, demoMode) : [];
  const location = useLocation();
  const currentTo = currentNavItem(
    items.map((item) => item.to),
    location.pathname,
    location.search,
  );
  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:bg-white focus:p-2"
      >
        Skip to content
      </a>
      <header className="border-b-4 border-ember-600 bg-ink text-white">
        <div className="mx-auto flex max-w-7xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
          <a href="/" className="flex items-baseline gap-2 text-xl font-bold tracking-tight">
            <span aria-hidden="true" className="inline-block h-3 w-3 rounded-full bg-ember-600" />
            Foamtally
          </a>
          {demoMode ? (
            <span className="rounded bg-caution-600 px-2 py-0.5 text-xs font-bold uppercase tracking-wide">
              Demo data — Alder Bend (invented)
            </span>
          ) : null}
          {user ? (
            <div className="ml-auto flex items-center gap-3 text-sm">
              <NavLink to="/profile" className="underline-offset-4 hover:underline">
                {user.name}
                <span className="sr-only">, your profile</span>
              </NavLink>
              <Form method="post" action="/sign-out" onSubmit={forgetUnsavedCopies}>
                <button type="submit" className="rounded border border-white/40 px-3 py-1.5 hover:bg-white/10">
                  Sign out
                </button>
              </Form>
            </div>
          ) : null}
        </div>
        {user ? (
          <nav aria-label="Main" className="bg-ink/95">
            <ul className="mx-auto flex max-w-7xl flex-wrap gap-1 px-2 pb-2 text-sm">
              {items.map((item) => (
                <li key={item.to}>
                  <Link
                    to={item.to}
                    aria-current={item.to === currentTo ? "page" : undefined}
                    className={`block whitespace-nowrap rounded px-3 py-2 ${item.to === currentTo ? "bg-white text-ink" : "text-white/90 hover:bg-white/10"}`}
                  >
                    {item.label}
                  </Link>
                </li>
              ))}
            </ul>
          </nav>
        ) : null}
      </header>
      {flash ? (
        <div role="status" className="border-b border-pond-600 bg-pond-50 px-4 py-2 text-center text-sm font-medium">
          {flash}
        </div>
      ) : null}
      <main id="main" className="mx-auto w-full max-w-7xl flex-1 px-4 py-6">
        {children}
      </main>
      <footer className="border-t border-stone-200 px-4 py-3 text-center text-xs text-slate-ft">
        Foamtally figures are estimates from what was entered. Local codes, permits and licensed practice govern.
        {user ? (
          <span className="ml-1">Signed in as {user.roles.map((role) => ROLE_LABELS[role]).join(", ")}.</span>
        ) : null}
      </footer>
    </div>
  );
}
