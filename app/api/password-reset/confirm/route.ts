// POST sets a new password with a reset link's token.
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { ACCOUNT_BODY_BYTES } from "@/lib/http/read-body";
import { resetPassword } from "@/lib/services/accounts";
import { passwordResetSchema } from "@/lib/validation/account-schemas";

export const POST = apiRoute(
  async (request) => {
    await resetPassword(await parseJson(request, passwordResetSchema));
    return new Response(null, { status: 204 });
  },
  { maxBodyBytes: ACCOUNT_BODY_BYTES },
);
