import type { Route } from "./+types/home";
import { RoleHome } from "~/components/role-home";
import { requireUser } from "~/lib/auth.server";

export const meta: Route.MetaFunction = () => [{ title: "Home · Foamtally" }];

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { name: user.name, roles: user.roles };
}

export default function Home({ loaderData }: Route.ComponentProps) {
  return (
    <div className="space-y-6">
      <h1 className="text-2xl font-bold">Welcome, {loaderData.name}</h1>
      <RoleHome roles={loaderData.roles} />
    </div>
  );
}
