// POST sends an invitation again with a fresh link for another 7 days; the earlier link stops working.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { resendInvitation } from "@/lib/services/teams";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return Response.json(
    await resendInvitation(actor, idParam((await params).id, "No such invitation.")),
  );
});
