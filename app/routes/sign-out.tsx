import { redirect } from "react-router";
import type { Route } from "./+types/sign-out";
import { recordAudit } from "~/lib/audit.server";
import { getUser } from "~/lib/auth.server";
import { clientAddress } from "~/lib/http.server";
import { destroySession, getSession } from "~/lib/session.server";

export async function loader() {
  throw redirect("/");
}

export async function action({ request }: Route.ActionArgs) {
  const user = await getUser(request);
  if (user) {
    await recordAudit({
      actorUserId: user.id,
      actorLabel: user.email,
      action: "sign_out",
      entityType: "user",
      entityId: user.id,
      clientAddress: clientAddress(request),
    });
  }
  const session = await getSession(request);
  throw redirect("/sign-in", { headers: { "Set-Cookie": await destroySession(session) } });
}
