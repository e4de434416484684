// GET one run's calibrated sample spectrum resampled onto an even axis, as compressed JCAMP-DX XYDATA
// (a download for programs that read only evenly spaced spectra; another team's run is not found).
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { reportResponse } from "@/lib/reports/report-response";
import { runSpectrumEvenJdx } from "@/lib/services/run-reports";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return reportResponse(
    await runSpectrumEvenJdx(actor, idParam((await params).id, "No such run.")),
  );
});
