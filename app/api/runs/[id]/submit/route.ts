// POST submits a draft or returned run for review, optionally naming the supervisor who should review it.
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { submitRun } from "@/lib/services/run-review-decisions";
import { submitRunSchema } from "@/lib/validation/review-schemas";
import { idParam } from "@/lib/validation/request-params";
import { requireActor } from "@/lib/auth/session";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const runId = idParam((await params).id, "No such run.");
  const input = await parseJson(request, submitRunSchema);
  return Response.json(await submitRun(actor, runId, input));
});
