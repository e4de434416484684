// GET a notebook's run summaries, newest first, filtered by ?status=&species=&instrumentId=&q=.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchNotebookRuns } from "@/lib/services/notebooks";
import { notebookRunsQuerySchema } from "@/lib/validation/notebook-schemas";
import { idParam, parseQuery } from "@/lib/validation/request-params";

export const GET = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const id = idParam((await params).id, "No such notebook.");
  const query = parseQuery(request, notebookRunsQuerySchema);
  return Response.json(await fetchNotebookRuns(actor, id, query));
});
