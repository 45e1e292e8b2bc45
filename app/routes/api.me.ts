import type { Route } from "./+types/api.me";
import { requireUser } from "~/lib/auth.server";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return Response.json({ id: user.id, name: user.name, email: user.email, roles: user.roles });
}
