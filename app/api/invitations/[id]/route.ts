// DELETE revokes an invitation not yet accepted (lab leads of its team): its link then refuses.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { revokeInvitation } from "@/lib/services/teams";
import { idParam } from "@/lib/validation/request-params";

export const DELETE = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  await revokeInvitation(actor, idParam((await params).id, "No such invitation."));
  return new Response(null, { status: 204 });
});
