// GET one run exactly as it was stored: settings, calibration, release, peaks, calls and evidence.
import { apiRoute, requireActor } from "@/lib/http/api-handler";
import { fetchRun } from "@/lib/services/runs";
import { idParam } from "@/lib/validation/line-schemas";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return Response.json(await fetchRun(actor, idParam((await params).id, "No such run.")));
});
