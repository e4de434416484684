// GET the team's instruments; POST creates one (lab leads).
import { requireActor } from "@/lib/auth/session";
import { defaultTeamId } from "@/lib/auth/default-team";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { createInstrument, fetchInstruments } from "@/lib/services/instruments";
import { instrumentCreateSchema } from "@/lib/validation/instrument-schemas";
import { teamIdQuery } from "@/lib/validation/request-params";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  return Response.json(await fetchInstruments(actor, teamIdQuery(request, defaultTeamId(actor))));
});

export const POST = apiRoute(async (request) => {
  const actor = await requireActor();
  const input = await parseJson(request, instrumentCreateSchema);
  return Response.json(await createInstrument(actor, input), { status: 201 });
});
