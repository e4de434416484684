// GET the team's members with their roles and when they joined (every member of the team).
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchTeamMembers } from "@/lib/services/team-members";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const teamId = idParam((await params).id, "No such team.");
  return Response.json(await fetchTeamMembers(actor, teamId));
});
