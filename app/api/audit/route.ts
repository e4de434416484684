// GET a team's audit trail: filtered, newest first, a page at a time (JSON with nextCursor), or with
// format=csv every matching event as a CSV download. Filters: teamId, actorId, entity, entityId,
// action (exact, or a prefix ending in "."), from/to (whole days in UTC, inclusive), cursor, limit.
import { AppError } from "@/lib/errors";
import { defaultTeamId } from "@/lib/auth/default-team";
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { exportAuditCsv, fetchAuditPage } from "@/lib/services/audit";
import { auditQuerySchema } from "@/lib/validation/audit-schemas";
import { parseFields } from "@/lib/validation/field-errors";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const query = parseFields(
    auditQuerySchema,
    Object.fromEntries(new URL(request.url).searchParams),
    "Some filters are not right.",
  );
  const { format, cursor, limit, ...filter } = query;
  const teamId = filter.teamId ?? defaultTeamId(actor);
  if (!teamId) throw new AppError("not_found", "You are not in a team yet.");
  if (format === "csv") {
    const { filename, stream } = await exportAuditCsv(actor, { ...filter, teamId });
    return new Response(stream, {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": `attachment; filename="${filename}"`,
        "cache-control": "no-store",
      },
    });
  }
  return Response.json(await fetchAuditPage(actor, { ...filter, teamId, cursor, limit }), {
    headers: { "cache-control": "no-store" },
  });
});
