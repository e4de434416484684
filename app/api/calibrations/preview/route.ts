// POST previews a calibration (same body as POST /api/calibrations, with excluded/added pairs): the fit,
// the model comparison, the lamp peaks and lines. Writes nothing.
import { requireActor } from "@/lib/auth/session";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { previewCalibration } from "@/lib/services/calibrations";
import { calibrationCreateSchema } from "@/lib/validation/calibration-schemas";

export const POST = apiRoute(async (request) => {
  const actor = await requireActor();
  const input = await parseJson(request, calibrationCreateSchema);
  return Response.json(await previewCalibration(actor, input));
});
