// GET the team's invitations not yet accepted nor revoked, expired ones included (lab leads only).
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchPendingInvitations } from "@/lib/services/teams";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const teamId = idParam((await params).id, "No such team.");
  return Response.json(await fetchPendingInvitations(actor, teamId));
});
