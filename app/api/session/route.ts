// POST signs in with e-mail and password (sets the session cookie); DELETE signs out.
import { clientAddress } from "@/lib/http/client-address";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { SIGN_IN_BODY_BYTES } from "@/lib/http/read-body";
import { endSession, startSession } from "@/lib/auth/session";
import { signIn } from "@/lib/services/accounts";
import { recordAudit } from "@/lib/services/audit";
import { signInSchema } from "@/lib/validation/account-schemas";
import { toMe } from "../me/to-me";

export const POST = apiRoute(
  async (request) => {
    const input = await parseJson(request, signInSchema);
    const actor = await signIn({ ...input, address: clientAddress(request.headers) });
    await startSession(actor);
    return Response.json(toMe(actor));
  },
  { maxBodyBytes: SIGN_IN_BODY_BYTES },
);

export const DELETE = apiRoute(async () => {
  const userId = await endSession();
  if (userId)
    await recordAudit({
      actorId: userId,
      action: "session.delete",
      entity: "user",
      entityId: userId,
    });
  return new Response(null, { status: 204 });
});
