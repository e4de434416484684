// POST previews a CSV import into the draft (body: {csv} as JSON, or the file as text/csv). Writes nothing.
import { apiRoute } from "@/lib/http/api-handler";
import { previewImport } from "@/lib/services/line-library-import";
import { IMPORT_ROUTE_OPTIONS, readImportBody } from "@/lib/validation/line-schemas";
import { requireActor } from "@/lib/auth/session";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const releaseId = idParam((await params).id, "No such release.");
  const { csv } = await readImportBody(request);
  return Response.json(await previewImport(actor, { releaseId, csvText: csv }));
}, IMPORT_ROUTE_OPTIONS);
