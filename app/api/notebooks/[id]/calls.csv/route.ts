// GET every call of a notebook's runs as CSV, one row per run and call (a download; another team's notebook is not found).
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { reportResponse } from "@/lib/reports/report-response";
import { notebookCallsCsv } from "@/lib/services/run-reports";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return reportResponse(
    await notebookCallsCsv(actor, idParam((await params).id, "No such notebook.")),
  );
});
