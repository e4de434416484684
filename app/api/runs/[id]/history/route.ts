// GET a run's review history: rounds with submitter, reviewer, decision, comments and marks, the signature, and its versions.
import { apiRoute } from "@/lib/http/api-handler";
import { fetchRunHistory } from "@/lib/services/run-review-history";
import { requireActor } from "@/lib/auth/session";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return Response.json(await fetchRunHistory(actor, idParam((await params).id, "No such run.")));
});
