// GET the runs of a team waiting for the signed-in supervisor's review, oldest first, with filters.
import { defaultTeamId } from "@/lib/auth/default-team";
import { can } from "@/lib/auth/policy";
import { AppError } from "@/lib/errors";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchReviewQueue } from "@/lib/services/review-queue";
import { zodFieldErrors } from "@/lib/validation/field-errors";
import { reviewQueueQueryFrom } from "@/lib/validation/review-schemas";
import { requireActor } from "@/lib/auth/session";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const search = new URL(request.url).searchParams;
  // Without ?teamId= the queue is that of the first team where the person reviews (else their default
  // team, which answers 403 when they review in none).
  const reviewing =
    actor.memberships.find((m) => can(actor, "run.review", { teamId: m.teamId }))?.teamId ??
    defaultTeamId(actor);
  const parsed = reviewQueueQueryFrom(
    (name) => search.get(name) ?? (name === "teamId" ? (reviewing ?? null) : null),
  );
  if (!parsed.success)
    throw new AppError("validation", "Some filters are not right.", {
      fieldErrors: zodFieldErrors(parsed.error),
    });
  return Response.json(await fetchReviewQueue(actor, parsed.data));
});
