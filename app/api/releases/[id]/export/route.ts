// GET the release as Emberline's line-table CSV (with line_key), as a download.
import { apiRoute } from "@/lib/http/api-handler";
import { exportReleaseCsv } from "@/lib/services/line-library-releases";
import { requireActor } from "@/lib/auth/session";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  const { filename, csv } = await exportReleaseCsv(
    actor,
    idParam((await params).id, "No such release."),
  );
  return new Response(csv, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${filename}"`,
    },
  });
});
