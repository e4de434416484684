// GET the runs of a team waiting for the signed-in supervisor's review, oldest first, with filters.
import { AppError } from "@/lib/errors";
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchReviewQueue } from "@/lib/services/run-review";
import { zodFieldErrors } from "@/lib/validation/field-errors";
import { reviewQueueQueryFrom } from "@/lib/validation/review-schemas";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const search = new URL(request.url).searchParams;
  // Without ?teamId= the queue is that of the first team where the person reviews (else their first team).
  const reviewing = actor.memberships.find((m) => m.role === "supervisor") ?? actor.memberships[0];
  const parsed = reviewQueueQueryFrom(
    (name) => search.get(name) ?? (name === "teamId" ? (reviewing?.teamId ?? null) : null),
  );
  if (!parsed.success)
    throw new AppError("validation", "Some filters are not right.", {
      fieldErrors: zodFieldErrors(parsed.error),
    });
  return Response.json(await fetchReviewQueue(actor, parsed.data));
});
