// POST invites a person by e-mail into a team with a role (lab leads only).
import { requireActor } from "@/lib/auth/session";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { ACCOUNT_BODY_BYTES } from "@/lib/http/read-body";
import { inviteMember } from "@/lib/services/teams";
import { invitationSchema } from "@/lib/validation/account-schemas";

export const POST = apiRoute(
  async (request) => {
    const actor = await requireActor();
    const input = await parseJson(request, invitationSchema);
    return Response.json(await inviteMember(actor, input), { status: 201 });
  },
  { maxBodyBytes: ACCOUNT_BODY_BYTES },
);
