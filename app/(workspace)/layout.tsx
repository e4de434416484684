// The signed-in shell: areas on the left (behind a menu button on narrow screens), the team switcher,
// the person and sign-out.
import type { ReactNode } from "react";
import { MainNav, type NavItem } from "@/components/shell/main-nav";
import { TeamSwitcher } from "@/components/shell/team-switcher";
import { ThemeToggle } from "@/components/shell/theme-toggle";
import { WorkspaceFrame } from "@/components/shell/workspace-frame";
import { can } from "@/lib/auth/policy";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { countRunsWaitingFor } from "@/lib/services/review-queue";
import { requireWorkspace } from "@/lib/services/workspace";
import { signOutAction, switchTeamAction } from "./actions";

export default async function WorkspaceLayout({ children }: { children: ReactNode }) {
  const { actor, team, canReadMail } = await requireWorkspace();
  // The policy decides who reviews: the Review area and its count follow `run.review`.
  const reviews = team !== undefined && can(actor, "run.review", { teamId: team.teamId });
  const waiting = reviews ? await countRunsWaitingFor(actor, team.teamId) : 0;
  const items: NavItem[] = [
    { href: "/", label: "Home" },
    { href: "/notebooks", label: "Notebooks" },
    { href: "/instruments", label: "Instruments" },
    { href: "/lines", label: "Line library" },
    ...(reviews
      ? [{ href: "/review", label: "Review", count: waiting, countLabel: "waiting for you" }]
      : []),
    { href: "/audit", label: "Audit trail" },
    { href: "/team", label: "Team" },
    ...(canReadMail ? [{ href: "/mail", label: "Outgoing mail" }] : []),
    { href: "/account", label: "Account" },
  ];
  return (
    <WorkspaceFrame
      brand={
        <p>
          <span className="text-ember-600" aria-hidden>
            ◆
          </span>{" "}
          Emberline
        </p>
      }
      sidebar={
        <>
          <TeamSwitcher
            memberships={actor.memberships}
            currentTeamId={team?.teamId}
            action={switchTeamAction}
          />
          <MainNav items={items} />
          <div className="mt-auto flex flex-col gap-2 border-t border-[var(--line)] pt-3 text-sm">
            <div>
              <p className="font-medium" data-testid="signed-in-name">
                {actor.name}
              </p>
              <p className="muted break-words text-xs">
                {actor.email}
                {team ? ` · ${ROLE_LABELS[team.role]}` : ""}
              </p>
            </div>
            <div className="flex items-center justify-between">
              <form action={signOutAction}>
                <button
                  type="submit"
                  className="min-h-10 rounded px-2 py-1 text-xs hover:bg-ink-100 sidebar:min-h-0 dark:hover:bg-ink-800"
                >
                  Sign out
                </button>
              </form>
              <ThemeToggle />
            </div>
          </div>
        </>
      }
    >
      {children}
    </WorkspaceFrame>
  );
}
