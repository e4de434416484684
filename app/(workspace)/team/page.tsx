// The team: its members and roles; lab leads invite people and see pending invitations.
import { PageHeader } from "@/components/ui/page-header";
import { EmptyState } from "@/components/ui/empty-state";
import { InviteForm } from "@/components/team/invite-form";
import { can } from "@/lib/auth/policy";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { fetchPendingInvitations, fetchTeamMembers } from "@/lib/services/teams";
import { requireWorkspace } from "@/lib/services/workspace";
import { inviteAction } from "../actions";

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
      <PageHeader title={team.teamName} description="Members and their roles in this team." />
      <div className="grid gap-5 lg:grid-cols-[1fr_20rem]">
        <section className="panel p-4" aria-labelledby="members-heading">
          <h2 id="members-heading" className="mb-2 font-semibold">
            Members ({members.length})
          </h2>
          <table className="w-full text-sm">
            <thead className="muted text-left text-xs">
              <tr>
                <th className="py-1 font-medium">Name</th>
                <th className="py-1 font-medium">E-mail</th>
                <th className="py-1 font-medium">Role</th>
              </tr>
            </thead>
            <tbody className="divide-line">
              {members.map((m) => (
                <tr key={m.userId}>
                  <td className="py-1.5">{m.name}</td>
                  <td className="py-1.5">{m.email}</td>
                  <td className="py-1.5">{ROLE_LABELS[m.role]}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {manage && pending.length > 0 ? (
            <>
              <h3 className="mt-5 mb-1 text-sm font-semibold">Invitations not yet accepted</h3>
              <ul className="divide-line text-sm">
                {pending.map((p) => (
                  <li key={p.id} className="py-1">
                    {p.email} — {ROLE_LABELS[p.role]}, until {p.expiresAt.slice(0, 10)}
                  </li>
                ))}
              </ul>
            </>
          ) : null}
        </section>
        {manage ? (
          <section className="panel p-4" aria-labelledby="invite-heading">
            <h2 id="invite-heading" className="mb-3 font-semibold">
              Invite a person
            </h2>
            <InviteForm teamId={team.teamId} action={inviteAction} />
          </section>
        ) : null}
      </div>
    </>
  );
}
