// GET lines of a release, filtered, sorted and paginated (default: the team's newest published release).
import { requireActor } from "@/lib/auth/session";
import { defaultTeamId } from "@/lib/auth/default-team";
import { apiRoute } from "@/lib/http/api-handler";
import { AppError } from "@/lib/errors";
import { fetchLines, fetchReleases } from "@/lib/services/line-library-reads";
import { lineQuerySchema } from "@/lib/validation/line-schemas";
import { parseFields } from "@/lib/validation/field-errors";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const query = parseFields(
    lineQuerySchema,
    Object.fromEntries(new URL(request.url).searchParams),
    "Some filters are not right.",
  );
  const { teamId: givenTeam, release, ...filters } = query;
  const teamId = givenTeam ?? defaultTeamId(actor);
  if (!teamId) throw new AppError("not_found", "You are not in a team yet.");
  let releaseId: string | undefined;
  let releaseNumber: number | undefined;
  if (release === "draft") {
    releaseId = (await fetchReleases(actor, teamId)).find((r) => r.status === "draft")?.id;
    if (!releaseId) throw new AppError("not_found", "The team has no draft.");
  } else if (typeof release === "number") releaseNumber = release;
  else releaseId = release;
  return Response.json(await fetchLines(actor, { teamId, releaseId, releaseNumber, ...filters }));
});
