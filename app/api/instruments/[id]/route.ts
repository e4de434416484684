// GET one instrument with its calibration history, newest first.
import { apiRoute, requireActor } from "@/lib/http/api-handler";
import { fetchCalibrations } from "@/lib/services/calibrations";
import { fetchInstrument } from "@/lib/services/instruments";
import { idParam } from "@/lib/validation/line-schemas";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const id = idParam((await params).id, "No such instrument.");
  const instrument = await fetchInstrument(actor, id);
  return Response.json({ ...instrument, calibrations: await fetchCalibrations(actor, id) });
});
