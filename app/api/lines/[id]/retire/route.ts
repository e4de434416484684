// POST retires a draft line: it stays in the draft and is left out when publishing (version and reason in the body).
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { retireLine } from "@/lib/services/line-library-draft";
import { lineStateSchema } from "@/lib/validation/line-schemas";
import { requireActor } from "@/lib/auth/session";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const lineId = idParam((await params).id, "No such line.");
  const input = await parseJson(request, lineStateSchema);
  return Response.json(await retireLine(actor, { lineId, ...input }));
});
