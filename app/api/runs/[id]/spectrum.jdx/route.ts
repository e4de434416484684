// GET one run's calibrated sample spectrum as JCAMP-DX (a download; another team's run is not found).
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { reportResponse } from "@/lib/reports/report-response";
import { runSpectrumJdx } from "@/lib/services/run-reports";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return reportResponse(await runSpectrumJdx(actor, idParam((await params).id, "No such run.")));
});
