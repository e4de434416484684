// GET the audit history of a line across the team's releases (by the line key of this row).
import { apiRoute } from "@/lib/http/api-handler";
import { fetchLine, fetchLineHistory } from "@/lib/services/line-library-reads";
import { requireActor } from "@/lib/auth/session";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const line = await fetchLine(actor, idParam((await params).id, "No such line."));
  return Response.json(await fetchLineHistory(actor, line.lineKey));
});
