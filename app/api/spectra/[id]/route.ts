// GET one uploaded spectrum's record (file name, hash, points, unit, who and when).
import { requireActor } from "@/lib/auth/session";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchSpectrum } from "@/lib/services/spectra";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return Response.json(await fetchSpectrum(actor, idParam((await params).id, "No such spectrum.")));
});
