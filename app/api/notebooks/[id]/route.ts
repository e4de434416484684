// GET one notebook's runs, newest first, with the species each called present.
import { apiRoute, requireActor } from "@/lib/http/api-handler";
import { fetchNotebookRuns } from "@/lib/services/runs";
import { idParam } from "@/lib/validation/line-schemas";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const id = idParam((await params).id, "No such notebook.");
  return Response.json({ id, runs: await fetchNotebookRuns(actor, id) });
});
