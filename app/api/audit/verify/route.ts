// GET /api/audit/verify?teamId= — lab leads: recompute the team's audit hash chain and report ok, or
// the first broken link (sequence, event id, what differs), with the head to keep outside the database.
import { AppError } from "@/lib/errors";
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { verifyAuditTrail } from "@/lib/services/audit-chain";
import { zodFieldErrors } from "@/lib/validation/field-errors";
import { auditVerifyQuerySchema } from "./schema";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const parsed = auditVerifyQuerySchema.safeParse(
    Object.fromEntries(new URL(request.url).searchParams),
  );
  if (!parsed.success) {
    throw new AppError("validation", "Choose a team.", {
      fieldErrors: zodFieldErrors(parsed.error),
    });
  }
  const report = await verifyAuditTrail(actor, parsed.data.teamId);
  return Response.json(report, { headers: { "cache-control": "no-store" } });
});
