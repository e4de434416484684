// PATCH {role} gives a member another role; DELETE removes them from the team (lab leads only; the
// team's last lab lead can neither be demoted nor removed: 409). Both apply from the member's next request.
import { requireActor } from "@/lib/auth/session";
import { apiRoute, parseJson } from "@/lib/http/api-handler";
import { ACCOUNT_BODY_BYTES } from "@/lib/http/read-body";
import { changeMemberRole, removeMember } from "@/lib/services/team-members";
import { memberRoleSchema } from "@/lib/validation/account-schemas";
import { idParam } from "@/lib/validation/request-params";

async function ids(params: Promise<Record<string, string>>) {
  const { id, userId } = await params;
  return {
    teamId: idParam(id, "No such team."),
    userId: idParam(userId, "This person is not a member of this team."),
  };
}

export const PATCH = apiRoute(
  async (request, { params }) => {
    const actor = await requireActor();
    const target = await ids(params);
    const { role } = await parseJson(request, memberRoleSchema);
    return Response.json(await changeMemberRole(actor, { ...target, role }));
  },
  { maxBodyBytes: ACCOUNT_BODY_BYTES },
);

export const DELETE = apiRoute(async (_request, { params }) => {
  const actor = await requireActor();
  await removeMember(actor, await ids(params));
  return new Response(null, { status: 204 });
});
