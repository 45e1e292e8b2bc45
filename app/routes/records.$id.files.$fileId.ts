import type { Route } from "./+types/records.$id.files.$fileId";
import { requireCapability } from "~/lib/access.server";
import { invariantResponse } from "~/lib/http.server";
import { packageFile } from "~/exports/release-package.server";

/** A stored file of a release package, exactly as it was built (and sent). */
export async function loader({ request, params }: Route.LoaderArgs) {
  await requireCapability(request, "records.manage");
  const requestId = Number(params.id);
  const fileId = Number(params.fileId);
  const file =
    Number.isInteger(requestId) && Number.isInteger(fileId) && requestId > 0 && fileId > 0
      ? await packageFile(requestId, fileId)
      : null;
  invariantResponse(file, "There is no such file.");
  return new Response(Buffer.from(file.body), {
    headers: {
      "Content-Type": file.contentType,
      "Content-Disposition": `attachment; filename="${file.fileName}"`,
      "Cache-Control": "private, no-store",
    },
  });
}
