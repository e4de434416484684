// POST adds a line to the draft (with a reason).
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { addLine } from "@/lib/services/line-library-draft";
import { addLineSchema, toLineInput } from "@/lib/validation/line-schemas";
import { requireActor } from "@/lib/auth/session";
import { idParam } from "@/lib/validation/request-params";

export const POST = apiRoute(async (request, { params }) => {
  const actor = await requireActor();
  const releaseId = idParam((await params).id, "No such release.");
  const input = await parseJson(request, addLineSchema);
  return Response.json(
    await addLine(actor, { releaseId, line: toLineInput(input.line), reason: input.reason }),
    {
      status: 201,
    },
  );
});
