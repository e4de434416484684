// GET compares two releases of one team by line key: added, removed, changed (with the fields).
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchRelease } from "@/lib/services/line-library-reads";
import { diffReleases } from "@/lib/services/line-library-releases";
import { diffQuerySchema } from "@/lib/validation/line-schemas";
import { parseFields } from "@/lib/validation/field-errors";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const query = parseFields(
    diffQuerySchema,
    Object.fromEntries(new URL(request.url).searchParams),
    "Name two releases.",
  );
  const { from, to } = query;
  const teamId = query.teamId ?? (await fetchRelease(actor, from)).teamId;
  return Response.json(await diffReleases(actor, { teamId, fromId: from, toId: to }));
});
