// POST applies a previewed import ({csv, fingerprint, skipRejected?, reason?}) in one transaction.
import { apiRoute } from "@/lib/http/api-handler";
import { applyImport } from "@/lib/services/line-library-import";
import {
  IMPORT_ROUTE_OPTIONS,
  importApplySchema,
  readImportBody,
} from "@/lib/validation/line-schemas";
import { idParam } from "@/lib/validation/request-params";
import { requireActor } from "@/lib/auth/session";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const releaseId = idParam((await params).id, "No such release.");
  const input = await readImportBody(request, importApplySchema);
  return Response.json(
    await applyImport(actor, {
      releaseId,
      csvText: input.csv,
      fingerprint: input.fingerprint,
      skipRejected: input.skipRejected,
      reason: input.reason,
    }),
  );
}, IMPORT_ROUTE_OPTIONS);
