// Home: the person's teams and what happened lately in the current one.
import Link from "next/link";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { fetchRecentActivity } from "@/lib/services/audit";
import { requireWorkspace } from "@/lib/services/workspace";

export const metadata = { title: "Home" };

export default async function HomePage() {
  const { actor, team } = await requireWorkspace();
  const activity = team ? await fetchRecentActivity(actor, team.teamId) : [];
  return (
    <>
      <PageHeader
        title={`Welcome, ${actor.name.split(" ")[0]}`}
        description="Your teams and their latest activity."
      />
      {actor.memberships.length === 0 ? (
        <EmptyState title="You are not in a team yet">
          Ask a lab lead to invite you; the invitation arrives by e-mail.
        </EmptyState>
      ) : (
        <div className="grid gap-5 lg:grid-cols-[18rem_1fr]">
          <section className="panel p-4" aria-labelledby="teams-heading">
            <h2 id="teams-heading" className="mb-2 font-semibold">
              Your teams
            </h2>
            <ul className="divide-line">
              {actor.memberships.map((m) => (
                <li key={m.teamId} className="flex justify-between py-1.5 text-sm">
                  <span>{m.teamName}</span>
                  <span className="muted">{ROLE_LABELS[m.role]}</span>
                </li>
              ))}
            </ul>
          </section>
          <section className="panel p-4" aria-labelledby="activity-heading">
            <h2 id="activity-heading" className="mb-2 font-semibold">
              Recent activity in {team?.teamName}
            </h2>
            {activity.length === 0 ? (
              <p className="muted text-sm">
                Nothing yet. Start in{" "}
                <Link href="/instruments" className="text-ember-600 underline">
                  Instruments
                </Link>{" "}
                or open a notebook.
              </p>
            ) : (
              <table className="w-full text-sm">
                <thead className="muted text-left text-xs">
                  <tr>
                    <th className="py-1 font-medium">When</th>
                    <th className="py-1 font-medium">Who</th>
                    <th className="py-1 font-medium">What</th>
                  </tr>
                </thead>
                <tbody className="divide-line">
                  {activity.map((event) => (
                    <tr key={event.id}>
                      <td className="tabular py-1 pr-3 whitespace-nowrap">
                        {new Date(event.at).toISOString().slice(0, 16).replace("T", " ")} UTC
                      </td>
                      <td className="py-1 pr-3">{event.actorName ?? "System"}</td>
                      <td className="py-1">
                        <code className="text-xs">{event.action}</code>
                        {event.reason ? <span className="muted"> — {event.reason}</span> : null}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            )}
          </section>
        </div>
      )}
    </>
  );
}
