"use client";
// Chooses the team the workspace shows; submits on change, with a button for keyboards without scripts.
import { ROLE_LABELS } from "@/lib/auth/roles";
import type { TeamMembership } from "@/lib/auth/actor";

export function TeamSwitcher({
  memberships,
  currentTeamId,
  action,
}: {
  memberships: TeamMembership[];
  currentTeamId?: string;
  action: (formData: FormData) => Promise<void>;
}) {
  if (memberships.length === 0) return null;
  return (
    <form action={action} className="flex flex-col gap-1">
      <label htmlFor="team-switcher" className="muted text-2xs uppercase tracking-wide">
        Team
      </label>
      <div className="flex gap-1">
        <select
          key={currentTeamId}
          id="team-switcher"
          name="teamId"
          defaultValue={currentTeamId}
          onChange={(event) => event.currentTarget.form?.requestSubmit()}
          className="min-h-10 w-full rounded border border-[var(--line)] bg-[var(--panel)] px-1 py-1 text-sm sidebar:min-h-0"
        >
          {memberships.map((m) => (
            <option key={m.teamId} value={m.teamId}>
              {m.teamName} — {ROLE_LABELS[m.role]}
            </option>
          ))}
        </select>
        <noscript>
          <button type="submit">Go</button>
        </noscript>
      </div>
    </form>
  );
}
