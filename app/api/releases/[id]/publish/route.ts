// POST publishes the draft as the next release (frozen from then on); the team is e-mailed.
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { publishDraft } from "@/lib/services/line-library-releases";
import { publishSchema } from "@/lib/validation/line-schemas";
import { requireActor } from "@/lib/auth/session";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const releaseId = idParam((await params).id, "No such release.");
  const { notes } = await parseJson(request, publishSchema);
  return Response.json(await publishDraft(actor, { releaseId, notes }));
});
