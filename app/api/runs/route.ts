// POST analyses a sample spectrum into a new run of a notebook (peaks, matches, calls, all stored).
import { requireActor } from "@/lib/auth/session";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { createRun } from "@/lib/services/runs";
import { runCreateSchema } from "@/lib/validation/run-schemas";

export const POST = apiRoute(async (request) => {
  const actor = await requireActor();
  const input = await parseJson(request, runCreateSchema);
  return Response.json(await createRun(actor, input), { status: 201 });
});
