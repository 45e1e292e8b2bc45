import type { Route } from "./+types/products.$productId.safety-sheet.versions.$versionId";
import { requireUser } from "~/lib/auth.server";
import { requireRecordId } from "~/lib/http.server";
import { storedFileDownload } from "~/models/stored-file-download.server";

// Earlier safety sheets are readable by the same people as the current one: anyone signed in.
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const productId = requireRecordId(request, params.productId, "No such file.");
  const id = requireRecordId(request, params.versionId, "No such file.");
  return storedFileDownload(request, user, {
    subject: "safety_sheet",
    subjectId: String(productId),
    versionId: id,
    action: "safety_sheet_downloaded",
    entityType: "foam_product",
  });
}
