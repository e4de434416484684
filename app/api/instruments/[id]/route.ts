// GET one instrument with its calibration history, newest first; PATCH edits it (lab leads; send every
// field and the version you saw: 409 when stale, or when the geometry of a calibrated instrument changes).
import { requireActor } from "@/lib/auth/session";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { fetchCalibrations } from "@/lib/services/calibrations";
import { fetchInstrument, updateInstrument } from "@/lib/services/instruments";
import { instrumentUpdateSchema } from "@/lib/validation/instrument-schemas";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const id = idParam((await params).id, "No such instrument.");
  const instrument = await fetchInstrument(actor, id);
  return Response.json({ ...instrument, calibrations: await fetchCalibrations(actor, id) });
});

export const PATCH = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const id = idParam((await params).id, "No such instrument.");
  const input = await parseJson(request, instrumentUpdateSchema);
  return Response.json(await updateInstrument(actor, id, input));
});
