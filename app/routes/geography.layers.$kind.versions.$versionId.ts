import type { Route } from "./+types/geography.layers.$kind.versions.$versionId";
import { requireCapability } from "~/lib/access.server";
import { isLayerKind } from "~/lib/geo/layers";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { storedFileDownload } from "~/models/stored-file-download.server";

/** An earlier, replaced file of a GeoJSON layer, as it was uploaded. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireCapability(request, "geography.read");
  const kind = params.kind;
  const id = requireRecordId(request, params.versionId, "No such layer file.");
  invariantResponse(isLayerKind(kind), "No such layer file.", 404);
  return storedFileDownload(request, user, {
    subject: "geo_layer",
    subjectId: kind,
    versionId: id,
    action: "layer_file_downloaded",
    entityType: "geo_layer",
  });
}
