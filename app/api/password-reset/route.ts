// POST asks for a password-reset link; always 202 so it cannot reveal which accounts exist.
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { SIGN_IN_BODY_BYTES } from "@/lib/http/read-body";
import { requestPasswordReset } from "@/lib/services/accounts";
import { passwordResetRequestSchema } from "@/lib/validation/account-schemas";

export const POST = apiRoute(async (request) => {
  await requestPasswordReset(await parseJson(request, passwordResetRequestSchema));
  return Response.json({ message: "If the address has an account, a reset link is on its way." }, { status: 202 });
}, { maxBodyBytes: SIGN_IN_BODY_BYTES });
