import { createCookieSessionStorage } from "react-router";
import { env } from "./env.server";

type SessionData = { userId: number; epoch: number };
type SessionFlash = { flash: string };

let storage: ReturnType<typeof createCookieSessionStorage<SessionData, SessionFlash>> | undefined;

export function sessionStorage() {
  storage ??= createCookieSessionStorage<SessionData, SessionFlash>({
    cookie: {
      name: "__foamtally",
      httpOnly: true,
      sameSite: "lax",
      path: "/",
      secure: env().COOKIE_SECURE,
      secrets: [env().SESSION_SECRET],
      maxAge: 60 * 60 * 12,
    },
  });
  return storage;
}

export async function getSession(request: Request) {
  return sessionStorage().getSession(request.headers.get("Cookie"));
}

export async function commitSession(session: Awaited<ReturnType<typeof getSession>>) {
  return sessionStorage().commitSession(session);
}

export async function destroySession(session: Awaited<ReturnType<typeof getSession>>) {
  return sessionStorage().destroySession(session);
}

/** Headers that carry a one-time message to the next page. */
export async function flashHeaders(request: Request, message: string): Promise<HeadersInit> {
  const session = await getSession(request);
  session.flash("flash", message);
  return { "Set-Cookie": await commitSession(session) };
}
