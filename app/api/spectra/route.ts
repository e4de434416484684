// GET lists the team's spectra, newest first (?teamId=&instrumentId=&kind=; records without bytes or points).
// POST uploads a spectrum file (multipart: file, instrumentId, kind, label, optional xUnit and medium) and stores it;
// POST /api/spectra/preview checks the same form without storing. Route handlers, not server actions,
// and outside the proxy's matcher, so no body cap applies but ours (UPLOAD_ROUTE_OPTIONS, read before sign-in is checked).
import { requireActor } from "@/lib/auth/session";
import { defaultTeamId } from "@/lib/auth/default-team";
import { apiRoute } from "@/lib/http/api-handler";
import { fetchSpectra, uploadSpectrum } from "@/lib/services/spectra";
import { spectraQuerySchema } from "@/lib/validation/notebook-schemas";
import { readUploadForm, UPLOAD_ROUTE_OPTIONS } from "./upload-form";
import { parseQuery, teamIdQuery } from "@/lib/validation/request-params";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  const teamId = teamIdQuery(request, defaultTeamId(actor));
  return Response.json(await fetchSpectra(actor, teamId, parseQuery(request, spectraQuerySchema)));
});

export const POST = apiRoute(async (request) => {
  const actor = await requireActor();
  const record = await uploadSpectrum(actor, await readUploadForm(request));
  return Response.json(record, { status: 201 });
}, UPLOAD_ROUTE_OPTIONS);
