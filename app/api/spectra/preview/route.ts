// POST checks an upload without storing it (multipart, the same fields as POST /api/spectra): 200 with
// the parsed facts, the duplicate warning and a thinned series for the preview chart; 413 when too
// big, 400 with the core's located message when the file cannot be read. Writes nothing.
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { previewSpectrumUpload } from "@/lib/services/spectra";
import { readUploadForm, UPLOAD_ROUTE_OPTIONS } from "../upload-form";

export const POST = apiRoute(async (request) => {
  const actor = await requireActor();
  return Response.json(await previewSpectrumUpload(actor, await readUploadForm(request)));
}, UPLOAD_ROUTE_OPTIONS);
