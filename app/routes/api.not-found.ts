import { apiError } from "~/lib/http.server";

// A resource route, so that an unknown `/api/*` address answers JSON and never the HTML page.
const notFound = () => apiError(404, "No such API route.");

export async function loader() {
  notFound();
}

export async function action() {
  notFound();
}
