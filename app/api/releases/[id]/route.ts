// GET one release's summary.
import { apiRoute } from "@/lib/http/api-handler";
import { fetchRelease } from "@/lib/services/line-library-reads";
import { requireActor } from "@/lib/auth/session";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return Response.json(await fetchRelease(actor, idParam((await params).id, "No such release.")));
});
