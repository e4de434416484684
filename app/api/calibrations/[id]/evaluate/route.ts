// POST {pixels} returns the calibrated wavelengths and their one-sigma uncertainties (nothing is written).
import { requireActor } from "@/lib/auth/session";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { evaluateStoredCalibration } from "@/lib/services/calibrations";
import { evaluateSchema } from "@/lib/validation/calibration-schemas";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(
  async (request, { params }) => {
    const actor = await requireActor();
    const id = idParam((await params).id, "No such calibration.");
    const { pixels } = await parseJson(request, evaluateSchema);
    return Response.json(await evaluateStoredCalibration(actor, id, pixels));
  },
  { maxBodyBytes: 2 * 1024 * 1024 },
);
