import type { Route } from "./+types/records.$id.files.$fileId";
import { requireCapability } from "~/lib/access.server";
import { invariantResponse, requireRecordId } from "~/lib/http.server";
import { packageFile } from "~/exports/release-package.server";

/** A stored file of a release package, exactly as it was built (and sent). */
export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "records.manage");
  const requestId = requireRecordId(request, params.id, "There is no such file.");
  const fileId = requireRecordId(request, params.fileId, "There is no such file.");
  const file = await packageFile(requestId, fileId);
  invariantResponse(file, "There is no such file.");
  return new Response(Buffer.from(file.body), {
    headers: {
      "Content-Type": file.contentType,
      "Content-Disposition": `attachment; filename="${file.fileName}"`,
      "Cache-Control": "private, no-store",
    },
  });
}
