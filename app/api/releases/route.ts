// GET the team's line-table releases, the draft first, then the newest published.
import { requireActor } from "@/lib/auth/session";
import { defaultTeamId } from "@/lib/auth/default-team";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchReleases } from "@/lib/services/line-library-reads";
import { teamIdQuery } from "@/lib/validation/request-params";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const teamId = teamIdQuery(request, defaultTeamId(actor));
  return Response.json(await fetchReleases(actor, teamId));
});
