// GET what is waiting for the signed-in person in a team (the home page's list): returned runs and
// drafts, the review queue for supervisors, the line table and old calibrations for lab leads.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchWaitingForYou } from "@/lib/services/waiting";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const teamId = idParam((await params).id, "No such team.");
  return Response.json(await fetchWaitingForYou(actor, teamId));
});
