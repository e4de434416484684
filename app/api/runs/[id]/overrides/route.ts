// POST overrides one call of a run with a reason ({species, verdict, reason}; verdict null withdraws).
import { requireActor } from "@/lib/auth/session";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { overrideCall } from "@/lib/services/runs";
import { runOverrideSchema } from "@/lib/validation/run-schemas";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const id = idParam((await params).id, "No such run.");
  const input = await parseJson(request, runOverrideSchema);
  return Response.json(await overrideCall(actor, id, input), { status: 201 });
});
