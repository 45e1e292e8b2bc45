import type { Route } from "./+types/reports.environmental-xlsx";
import { requireUser } from "~/lib/auth.server";
import { rethrowDatabaseDown } from "~/lib/http.server";
import { ENVIRONMENTAL_READERS, generatedDownload, periodFrom, workbookRequestFor } from "./environmental-files.server";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request, ENVIRONMENTAL_READERS);
  const period = await periodFrom(new URL(request.url).searchParams);
  try {
    return await generatedDownload("xlsx", await workbookRequestFor(period, user));
  } catch (error) {
    rethrowDatabaseDown(request, error);
  }
}
