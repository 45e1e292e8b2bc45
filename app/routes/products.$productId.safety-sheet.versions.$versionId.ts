import type { Route } from "./+types/products.$productId.safety-sheet.versions.$versionId";
import { requireUser } from "~/lib/auth.server";
import { invariantResponse } from "~/lib/http.server";
import { storedFileDownload } from "~/models/stored-file-download.server";

// Earlier safety sheets are readable by the same people as the current one: anyone signed in.
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const productId = Number(params.productId);
  const id = Number(params.versionId);
  invariantResponse(
    Number.isInteger(productId) && productId > 0 && Number.isInteger(id) && id > 0,
    "No such file.",
    404,
  );
  return storedFileDownload(request, user, {
    subject: "safety_sheet",
    subjectId: String(productId),
    versionId: id,
    action: "safety_sheet_downloaded",
    entityType: "foam_product",
  });
}
