// POST marks the previewed agreeing rows verified with their citations and applies the decisions on
// disagreements ({csv, medium?, fingerprint, decisions?, reason?}), in one transaction with one audit event.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { applyReferenceCheck } from "@/lib/services/line-reference-check";
import {
  readImportBody,
  REFERENCE_CHECK_ROUTE_OPTIONS,
  referenceCheckApplySchema,
} from "@/lib/validation/line-schemas";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const releaseId = idParam((await params).id, "No such release.");
  const input = await readImportBody(request, referenceCheckApplySchema);
  return Response.json(
    await applyReferenceCheck(actor, {
      releaseId,
      csvText: input.csv,
      medium: input.medium,
      fingerprint: input.fingerprint,
      decisions: input.decisions,
      reason: input.reason,
    }),
  );
}, REFERENCE_CHECK_ROUTE_OPTIONS);
