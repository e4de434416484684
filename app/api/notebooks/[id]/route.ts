// GET one notebook with its runs, newest first; PATCH renames it ({title, version}: 409 when stale).
import { requireActor } from "@/lib/auth/session";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { fetchNotebook, fetchNotebookRuns, renameNotebook } from "@/lib/services/notebooks";
import { notebookRenameSchema } from "@/lib/validation/notebook-schemas";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const id = idParam((await params).id, "No such notebook.");
  const notebook = await fetchNotebook(actor, id);
  return Response.json({ ...notebook, runs: await fetchNotebookRuns(actor, id) });
});

export const PATCH = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const id = idParam((await params).id, "No such notebook.");
  const input = await parseJson(request, notebookRenameSchema);
  return Response.json(await renameNotebook(actor, id, input));
});
