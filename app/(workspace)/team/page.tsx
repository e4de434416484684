// The team: its members with their roles. Lab leads also change roles, remove members, invite
// people and resend or revoke invitations; everyone else sees the list without controls.
import { PageHeader } from "@/components/ui/page-header";
import { EmptyState } from "@/components/ui/empty-state";
import { InviteForm } from "@/components/team/invite-form";
import { MemberManager } from "@/components/team/member-manager";
import { PendingInvitations } from "@/components/team/pending-invitations";
import { can } from "@/lib/auth/policy";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { fetchTeamMembers } from "@/lib/services/team-members";
import { fetchPendingInvitations } from "@/lib/services/teams";
import { requireWorkspace } from "@/lib/services/workspace";
import { inviteAction } from "../actions";
import {
  changeMemberRoleAction,
  removeMemberAction,
  resendInvitationAction,
  revokeInvitationAction,
} from "./actions";
import { TableScroll } from "@/components/ui/table-scroll";

export const metadata = { title: "Team" };

export default async function TeamPage() {
  const { actor, team } = await requireWorkspace();
  if (!team)
    return <EmptyState title="You are not in a team yet">Ask a lab lead to invite you.</EmptyState>;
  const manage = can(actor, "team.manageMembers", { teamId: team.teamId });
  const [members, pending] = await Promise.all([
    fetchTeamMembers(actor, team.teamId),
    manage ? fetchPendingInvitations(actor, team.teamId) : Promise.resolve([]),
  ]);
  return (
    <>
      <PageHeader
        title={team.teamName}
        description={
          manage
            ? "Members and their roles in this team. As lab lead you change roles, remove members and manage invitations; the team always keeps at least one lab lead."
            : "Members and their roles in this team. Lab leads manage membership."
        }
      />
      <div className="grid gap-5 lg:grid-cols-[1fr_20rem]">
        <section className="panel min-w-0 p-4" aria-labelledby="members-heading">
          {manage ? (
            <>
              <MemberManager
                teamId={team.teamId}
                teamName={team.teamName}
                members={members}
                currentUserId={actor.id}
                changeRoleAction={changeMemberRoleAction}
                removeAction={removeMemberAction}
              />
              <PendingInvitations
                invitations={pending}
                resendAction={resendInvitationAction}
                revokeAction={revokeInvitationAction}
              />
            </>
          ) : (
            <>
              <h2 id="members-heading" className="mb-2 font-semibold">
                Members ({members.length})
              </h2>
              <TableScroll label="Members">
                <table className="w-full text-sm">
                  <thead className="muted text-left text-xs">
                    <tr>
                      <th className="py-1 pr-3 font-medium">Name</th>
                      <th className="py-1 pr-3 font-medium">E-mail</th>
                      <th className="py-1 pr-3 font-medium">Role</th>
                      <th className="py-1 font-medium">Joined</th>
                    </tr>
                  </thead>
                  <tbody className="divide-line">
                    {members.map((m) => (
                      <tr key={m.userId} data-testid="member-row" data-email={m.email}>
                        <td className="py-1.5 pr-3">
                          {m.name}
                          {m.userId === actor.id ? <span className="muted"> (you)</span> : null}
                        </td>
                        <td className="py-1.5 pr-3 wrap-anywhere">{m.email}</td>
                        <td className="py-1.5 pr-3">{ROLE_LABELS[m.role]}</td>
                        <td className="tabular py-1.5 whitespace-nowrap">
                          {m.joinedAt.slice(0, 10)}
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </TableScroll>
            </>
          )}
        </section>
        {manage ? (
          <section className="panel self-start p-4" aria-labelledby="invite-heading">
            <h2 id="invite-heading" className="mb-3 font-semibold">
              Invite a person
            </h2>
            <InviteForm
              teamId={team.teamId}
              pendingEmails={pending.map((invitation) => invitation.email)}
              action={inviteAction}
            />
          </section>
        ) : null}
      </div>
    </>
  );
}
