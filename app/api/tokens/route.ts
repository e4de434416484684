// GET the person's active access tokens; POST creates one and returns its secret once.
import { requireActor } from "@/lib/auth/session";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { ACCOUNT_BODY_BYTES } from "@/lib/http/read-body";
import { createAccessToken, fetchAccessTokens } from "@/lib/services/access-tokens";
import { tokenCreateSchema } from "@/lib/validation/account-schemas";

export const GET = apiRoute(async () =>
  Response.json(await fetchAccessTokens(await requireActor())),
);

export const POST = apiRoute(
  async (request) => {
    const actor = await requireActor();
    const input = await parseJson(request, tokenCreateSchema);
    return Response.json(await createAccessToken(actor, input), { status: 201 });
  },
  { maxBodyBytes: ACCOUNT_BODY_BYTES },
);
