// POST accepts an invitation: sets the new person's password (or checks an existing one) and joins.
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { clientAddress } from "@/lib/http/client-address";
import { ACCOUNT_BODY_BYTES } from "@/lib/http/read-body";
import { startSession } from "@/lib/auth/session";
import { loadActor } from "@/lib/services/accounts";
import { acceptInvitation } from "@/lib/services/teams";
import { acceptInvitationSchema } from "@/lib/validation/account-schemas";

export const POST = apiRoute(
  async (request) => {
    const input = await parseJson(request, acceptInvitationSchema);
    const userId = await acceptInvitation({ ...input, address: clientAddress(request.headers) });
    await startSession((await loadActor(userId))!);
    return Response.json({ userId }, { status: 201 });
  },
  { maxBodyBytes: ACCOUNT_BODY_BYTES },
);
