// POST re-runs a run's sample against the team's newest published line-table release: a new run.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { rerunRun } from "@/lib/services/runs";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return Response.json(await rerunRun(actor, idParam((await params).id, "No such run.")), {
    status: 201,
  });
});
