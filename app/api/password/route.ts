// POST changes the signed-in person's password (the current one is asked again).
import { apiRoute, parseJson, requireActor } from "@/lib/http/api-handler";
import { ACCOUNT_BODY_BYTES } from "@/lib/http/read-body";
import { currentSessionId, usesBearerToken } from "@/lib/auth/session";
import { changePassword } from "@/lib/services/accounts";
import { passwordChangeSchema } from "@/lib/validation/account-schemas";

export const POST = apiRoute(
  async (request) => {
    const actor = await requireActor();
    const keepSessionId = (await usesBearerToken()) ? undefined : await currentSessionId();
    await changePassword(actor, await parseJson(request, passwordChangeSchema), { keepSessionId });
    return new Response(null, { status: 204 });
  },
  { maxBodyBytes: ACCOUNT_BODY_BYTES },
);
