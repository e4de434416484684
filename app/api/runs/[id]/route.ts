// GET one run exactly as it was stored: settings, calibration, release, peaks, calls (with the standing
// verdict, the computed one and the override) and evidence. PATCH saves its notes ({notes, lockVersion}) and
// answers the notes' record ({id, notes, lockVersion, updatedAt}), not the whole run.
import { requireActor } from "@/lib/auth/session";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { fetchRun, updateRunNotes } from "@/lib/services/runs";
import { runNotesSchema } from "@/lib/validation/run-schemas";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return Response.json(await fetchRun(actor, idParam((await params).id, "No such run.")));
});

export const PATCH = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const id = idParam((await params).id, "No such run.");
  const input = await parseJson(request, runNotesSchema);
  return Response.json(await updateRunNotes(actor, id, input));
});
