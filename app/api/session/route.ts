// POST signs in with e-mail and password (sets the session cookie); DELETE signs out.
import { apiRoute, clientAddress, parseJson } from "@/lib/http/api-handler";
import { getSession } from "@/lib/auth/session";
import { signIn } from "@/lib/services/accounts";
import { recordAudit } from "@/lib/services/audit";
import { signInSchema } from "@/lib/validation/account-schemas";
import { toMe } from "../me/to-me";

export const POST = apiRoute(async (request) => {
  const input = await parseJson(request, signInSchema);
  const actor = await signIn({ ...input, address: clientAddress(request) });
  const session = await getSession();
  session.userId = actor.id;
  session.teamId = actor.memberships[0]?.teamId;
  session.signedInAt = Date.now();
  await session.save();
  return Response.json(toMe(actor));
});

export const DELETE = apiRoute(async () => {
  const session = await getSession();
  if (session.userId) {
    await recordAudit({ actorId: session.userId, action: "session.delete", entity: "user", entityId: session.userId });
  }
  session.destroy();
  return new Response(null, { status: 204 });
});
