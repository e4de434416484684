// POST restores a retired draft line (version and reason in the body).
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { restoreLine } from "@/lib/services/line-library-draft";
import { lineStateSchema } from "@/lib/validation/line-schemas";
import { requireActor } from "@/lib/auth/session";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const lineId = idParam((await params).id, "No such line.");
  const input = await parseJson(request, lineStateSchema);
  return Response.json(await restoreLine(actor, { lineId, ...input }));
});
