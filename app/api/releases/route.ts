// GET the team's line-table releases, the draft first, then the newest published.
import { requireActor } from "@/lib/auth/session";
import { defaultTeamId } from "@/lib/auth/default-team";
import { apiRoute } from "@/lib/http/api-handler";
import { AppError } from "@/lib/errors";
import { fetchReleases } from "@/lib/services/line-library-reads";
import { z } from "zod";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const given = new URL(request.url).searchParams.get("teamId");
  if (given !== null && !z.uuid().safeParse(given).success)
    throw new AppError("not_found", "No such team.");
  const teamId = given ?? defaultTeamId(actor);
  if (!teamId) throw new AppError("not_found", "You are not in a team yet.");
  return Response.json(await fetchReleases(actor, teamId));
});
