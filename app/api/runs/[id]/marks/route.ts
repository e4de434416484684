// POST records a supervisor's mark on a submitted run: agree or disagree with a call, or a comment on a call or one of its lines.
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { addReviewMark } from "@/lib/services/run-review-decisions";
import { reviewMarkSchema } from "@/lib/validation/review-schemas";
import { idParam } from "@/lib/validation/request-params";
import { requireActor } from "@/lib/auth/session";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const runId = idParam((await params).id, "No such run.");
  const input = await parseJson(request, reviewMarkSchema);
  return Response.json(await addReviewMark(actor, runId, input), { status: 201 });
});
