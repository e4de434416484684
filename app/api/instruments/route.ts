// GET the team's instruments; POST creates one (lab leads).
import { apiRoute, parseJson, requireActor } from "@/lib/http/api-handler";
import { createInstrument, fetchInstruments } from "@/lib/services/instruments";
import { instrumentCreateSchema } from "@/lib/validation/instrument-schemas";
import { teamIdQuery } from "@/lib/validation/team-id-query";

export const GET = apiRoute(async (request) => {
  const actor = await requireActor();
  return Response.json(
    await fetchInstruments(actor, teamIdQuery(request, actor.memberships[0]?.teamId)),
  );
});

export const POST = apiRoute(async (request) => {
  const actor = await requireActor();
  const input = await parseJson(request, instrumentCreateSchema);
  return Response.json(await createInstrument(actor, input), { status: 201 });
});
