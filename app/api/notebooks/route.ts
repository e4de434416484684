// GET the team's notebooks (?teamId=&q=: title search, run counts, newest activity first); POST creates one.
import { requireActor } from "@/lib/auth/session";
import { defaultTeamId } from "@/lib/auth/default-team";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { createNotebook, fetchNotebooks } from "@/lib/services/notebooks";
import { notebookCreateSchema, notebookListQuerySchema } from "@/lib/validation/notebook-schemas";
import { parseQuery, teamIdQuery } from "@/lib/validation/request-params";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const teamId = teamIdQuery(request, defaultTeamId(actor));
  return Response.json(
    await fetchNotebooks(actor, teamId, parseQuery(request, notebookListQuerySchema)),
  );
});

export const POST = apiRoute(async (request) => {
  const actor = await requireActor();
  const input = await parseJson(request, notebookCreateSchema);
  return Response.json(await createNotebook(actor, input), { status: 201 });
});
