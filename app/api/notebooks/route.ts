// GET the team's notebooks (?teamId=); POST creates one.
import { apiRoute, parseJson, requireActor } from "@/lib/http/api-handler";
import { createNotebook, fetchNotebooks } from "@/lib/services/notebooks";
import { notebookCreateSchema, teamIdQuery } from "@/lib/validation/workflow-schemas";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  return Response.json(await fetchNotebooks(actor, teamIdQuery(request, actor.memberships[0]?.teamId)));
});

export const POST = apiRoute(async (request) => {
  const actor = await requireActor();
  const input = await parseJson(request, notebookCreateSchema);
  return Response.json(await createNotebook(actor, input), { status: 201 });
});
