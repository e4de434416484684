// POST compares the draft with a reference file ({csv, medium?} as JSON, or the file as text/csv with
// ?medium=air|vacuum) and answers what agrees, what disagrees and what is on one side only. Writes nothing.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { previewReferenceCheck } from "@/lib/services/line-reference-check";
import {
  readImportBody,
  REFERENCE_CHECK_ROUTE_OPTIONS,
  referenceCheckPreviewSchema,
} from "@/lib/validation/line-schemas";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const releaseId = idParam((await params).id, "No such release.");
  const input = await readImportBody(request, referenceCheckPreviewSchema);
  return Response.json(
    await previewReferenceCheck(actor, { releaseId, csvText: input.csv, medium: input.medium }),
  );
}, REFERENCE_CHECK_ROUTE_OPTIONS);
