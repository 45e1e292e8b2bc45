import { httpError } from "~/lib/http.server";
import { apiError, isApiRequest } from "~/lib/http.server";
import type { Route } from "./+types/not-found";

export async function loader({ request }: Route.LoaderArgs) {
  if (isApiRequest(request)) apiError(404, "No such API route.");
  httpError(404, "There is nothing at this address.");
}

export async function action({ request }: Route.ActionArgs) {
  if (isApiRequest(request)) apiError(404, "No such API route.");
  httpError(404, "There is nothing at this address.");
}

export default function NotFound() {
  return null;
}
