// Home: what is waiting for the person in the current team, their teams, and what happened lately,
// in words.
import Link from "next/link";
import { WaitingPanel } from "@/components/home/waiting-panel";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { fetchRecentActivity } from "@/lib/services/audit";
import { fetchWaitingForYou } from "@/lib/services/waiting";
import { requireWorkspace } from "@/lib/services/workspace";

export const metadata = { title: "Home" };

export default async function HomePage() {
  const { actor, team } = await requireWorkspace();
  const [activity, waiting] = team
    ? await Promise.all([
        fetchRecentActivity(actor, team.teamId),
        fetchWaitingForYou(actor, team.teamId),
      ])
    : [[], null];
  return (
    <>
      <PageHeader
        title={`Welcome, ${actor.name.split(" ")[0]}`}
        description="What is waiting for you, your teams and their latest activity."
      />
      {actor.memberships.length === 0 ? (
        <EmptyState title="You are not in a team yet">
          Ask a lab lead to invite you; the invitation arrives by e-mail.
        </EmptyState>
      ) : (
        <div className="grid gap-5 lg:grid-cols-[18rem_1fr]">
          {waiting ? (
            <div className="lg:col-span-2">
              <WaitingPanel waiting={waiting} />
            </div>
          ) : null}
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
              <ul className="divide-line text-sm" data-testid="activity">
                {activity.map((event) => (
                  <li key={event.id} className="flex flex-wrap justify-between gap-x-3 py-1">
                    <span>
                      {event.href ? (
                        <Link href={event.href} className="hover:underline">
                          {event.sentence}
                        </Link>
                      ) : (
                        event.sentence
                      )}
                      {event.reason ? <span className="muted"> — {event.reason}</span> : null}
                    </span>
                    <time dateTime={event.at} className="tabular muted text-xs whitespace-nowrap">
                      {event.at.slice(0, 16).replace("T", " ")} UTC
                    </time>
                  </li>
                ))}
              </ul>
            )}
          </section>
        </div>
      )}
    </>
  );
}
