// DELETE revokes one of the person's access tokens.
import { apiRoute, requireActor } from "@/lib/http/api-handler";
import { revokeAccessToken } from "@/lib/services/access-tokens";
import { notFound } from "@/lib/errors";
import { z } from "zod";

export const DELETE = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const { id } = await params;
  if (!z.uuid().safeParse(id).success) throw notFound("No such token.");
  await revokeAccessToken(actor, id);
  return new Response(null, { status: 204 });
});
