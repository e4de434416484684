// POST amends a signed run: a new draft version linked to it, with the same analysis, notes and standing overrides.
import { apiRoute } from "@/lib/http/api-handler";
import { amendRun } from "@/lib/services/run-amendments";
import { requireActor } from "@/lib/auth/session";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const runId = idParam((await params).id, "No such run.");
  return Response.json(await amendRun(actor, runId), { status: 201 });
});
