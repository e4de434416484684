// DELETE revokes one of the person's access tokens.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { revokeAccessToken } from "@/lib/services/access-tokens";
import { idParam } from "@/lib/validation/request-params";

export const DELETE = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const id = idParam((await params).id, "No such token.");
  await revokeAccessToken(actor, id);
  return new Response(null, { status: 204 });
});
