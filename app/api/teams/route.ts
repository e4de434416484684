// GET the teams of the signed-in person with their role in each.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";

export const GET = apiRoute(async () => {
  const actor = await requireActor();
  return Response.json(
    actor.memberships.map((m) => ({ id: m.teamId, name: m.teamName, role: m.role })),
  );
});
