// POST returns the team's draft, opening one from the newest published release when there is none.
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { openDraft } from "@/lib/services/line-library-draft";
import { openDraftSchema } from "@/lib/validation/line-schemas";
import { requireActor } from "@/lib/auth/session";

export const POST = apiRoute(async (request) => {
  const actor = await requireActor();
  const { teamId } = await parseJson(request, openDraftSchema);
  return Response.json(await openDraft(actor, teamId));
});
