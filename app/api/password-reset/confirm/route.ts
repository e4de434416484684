// POST sets a new password with a reset link's token; answers what it ended (every session and
// every access token of the person) and unlocks their password throttle.
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { clientAddress } from "@/lib/http/client-address";
import { ACCOUNT_BODY_BYTES } from "@/lib/http/read-body";
import { describeRevoked, resetPassword } from "@/lib/services/accounts";
import { passwordResetSchema } from "@/lib/validation/account-schemas";

export const POST = apiRoute(
  async (request) => {
    const input = await parseJson(request, passwordResetSchema);
    const revoked = await resetPassword({ ...input, address: clientAddress(request.headers) });
    return Response.json({
      message: `Your password is changed. ${describeRevoked(revoked, "reset")}`,
      revoked,
    });
  },
  { maxBodyBytes: ACCOUNT_BODY_BYTES },
);
