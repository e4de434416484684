// GET one calibration: model, pairs, residuals, covered range, drift, release and software version.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchCalibration } from "@/lib/services/calibrations";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return Response.json(
    await fetchCalibration(actor, idParam((await params).id, "No such calibration.")),
  );
});
