// GET an instrument's calibrations (?instrumentId=), newest first; POST calibrates from a lamp spectrum
// (with the workbench's excluded/added pairs: it saves exactly what POST /api/calibrations/preview shows).
import { AppError } from "@/lib/errors";
import { requireActor } from "@/lib/auth/session";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { createCalibration, fetchCalibrations } from "@/lib/services/calibrations";
import { calibrationCreateSchema } from "@/lib/validation/calibration-schemas";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const given = new URL(request.url).searchParams.get("instrumentId");
  if (!given) throw new AppError("validation", "Say which instrument (?instrumentId=).");
  return Response.json(await fetchCalibrations(actor, idParam(given, "No such instrument.")));
});

export const POST = apiRoute(async (request) => {
  const actor = await requireActor();
  const input = await parseJson(request, calibrationCreateSchema);
  return Response.json(await createCalibration(actor, input), { status: 201 });
});
