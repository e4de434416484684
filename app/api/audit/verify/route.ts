// GET /api/audit/verify?teamId= — lab leads: recompute the team's audit hash chain and report ok, or
// the first broken link (sequence, event id, what differs), with the head to keep outside the database.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { verifyAuditTrail } from "@/lib/services/audit-chain";
import { parseFields } from "@/lib/validation/field-errors";
import { auditVerifyQuerySchema } from "./schema";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const { teamId } = parseFields(
    auditVerifyQuerySchema,
    Object.fromEntries(new URL(request.url).searchParams),
    "Choose a team.",
  );
  const report = await verifyAuditTrail(actor, teamId);
  return Response.json(report, { headers: { "cache-control": "no-store" } });
});
