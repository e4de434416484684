// POST decides a submitted run's review round: return it with a comment, or sign it (the password is asked again).
import { clientAddress } from "@/lib/http/client-address";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { reviewRun } from "@/lib/services/run-review-decisions";
import { reviewDecisionSchema } from "@/lib/validation/review-schemas";
import { idParam } from "@/lib/validation/request-params";
import { requireActor } from "@/lib/auth/session";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const runId = idParam((await params).id, "No such run.");
  const input = await parseJson(request, reviewDecisionSchema);
  return Response.json(
    await reviewRun(actor, runId, input, { address: clientAddress(request.headers) }),
  );
});
