// GET one line row; PATCH corrects it in the draft (with the version it was read at and a reason).
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { updateLine } from "@/lib/services/line-library-draft";
import { fetchLine } from "@/lib/services/line-library-reads";
import { toLineChanges, updateLineSchema } from "@/lib/validation/line-schemas";
import { requireActor } from "@/lib/auth/session";
import { idParam } from "@/lib/validation/request-params";

export const GET = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  return Response.json(await fetchLine(actor, idParam((await params).id, "No such line.")));
});

export const PATCH = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const lineId = idParam((await params).id, "No such line.");
  const input = await parseJson(request, updateLineSchema);
  return Response.json(
    await updateLine(actor, {
      lineId,
      version: input.version,
      line: toLineChanges(input.line),
      reason: input.reason,
    }),
  );
});
