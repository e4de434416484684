// POST asks for a password-reset link; always 202 (429 when this address asked too often), so it
// cannot reveal which accounts exist; the mail is queued, not awaited.
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { clientAddress } from "@/lib/http/client-address";
import { SIGN_IN_BODY_BYTES } from "@/lib/http/read-body";
import { requestPasswordReset } from "@/lib/services/accounts";
import { passwordResetRequestSchema } from "@/lib/validation/account-schemas";

export const POST = apiRoute(
  async (request) => {
    const input = await parseJson(request, passwordResetRequestSchema);
    await requestPasswordReset({ ...input, address: clientAddress(request.headers) });
    return Response.json(
      { message: "If the address has an account, a reset link is on its way." },
      { status: 202 },
    );
  },
  { maxBodyBytes: SIGN_IN_BODY_BYTES },
);
