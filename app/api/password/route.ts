// POST changes the signed-in person's password (the current one is asked again, under the password
// throttle); answers what it ended: the other sessions and every access token.
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { clientAddress } from "@/lib/http/client-address";
import { ACCOUNT_BODY_BYTES } from "@/lib/http/read-body";
import { currentSessionId, requireActor, usesBearerToken } from "@/lib/auth/session";
import { changePassword, describeRevoked } from "@/lib/services/accounts";
import { passwordChangeSchema } from "@/lib/validation/account-schemas";

export const POST = apiRoute(
  async (request) => {
    const actor = await requireActor();
    const keepSessionId = (await usesBearerToken()) ? undefined : await currentSessionId();
    const input = await parseJson(request, passwordChangeSchema);
    const revoked = await changePassword(actor, input, {
      keepSessionId,
      address: clientAddress(request.headers),
    });
    return Response.json({
      message: `Your password is changed. ${describeRevoked(revoked, "change")}`,
      revoked,
    });
  },
  { maxBodyBytes: ACCOUNT_BODY_BYTES },
);
