import type { Route } from "./+types/products.$productId.safety-sheet";
import { requireUser } from "~/lib/auth.server";
import { httpError, invariantResponse, requireRecordId } from "~/lib/http.server";
import { getObject, StorageUnavailableError } from "~/lib/storage.server";
import { recordDownload, sha256Hex } from "~/models/download-audit.server";
import { getSafetySheetKey } from "~/models/product.server";

// Safety sheets are for everyone who handles foam, so any signed-in person may read them.
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const id = requireRecordId(request, params.productId, "No such product.");
  const sheet = await getSafetySheetKey(id);
  invariantResponse(sheet, "This product has no safety sheet.");
  try {
    const file = await getObject(sheet.key);
    const filename = sheet.name.replace(/[^\w.-]+/g, "_");
    await recordDownload(request, user, {
      action: "safety_sheet_downloaded",
      entityType: "foam_product",
      entityId: id,
      summary: `Safety sheet ${sheet.name} downloaded`,
      details: { key: sheet.key, fileName: sheet.name, sha256: sha256Hex(file.body), byteSize: file.body.byteLength },
    });
    return new Response(new Uint8Array(file.body), {
      headers: {
        "Content-Type": "application/pdf",
        "Content-Disposition": `attachment; filename="${filename}"`,
        "Cache-Control": "private, no-store",
        "X-Content-Type-Options": "nosniff",
      },
    });
  } catch (error) {
    if (error instanceof StorageUnavailableError) {
      httpError(503, "The file store is not answering right now; please try again in a minute.");
    }
    throw error;
  }
}
