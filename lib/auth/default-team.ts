// The team a person works in when nothing names one: pages open in it until the team switcher
// chooses another, and API routes answer for it when a request gives no ?teamId=.
import type { Actor, TeamMembership } from "./actor";
import type { TeamRole } from "./roles";

/** How far a role reaches: a lab lead's over a supervisor's over a chemist's. */
const ROLE_WIDTH: Record<TeamRole, number> = { lab_lead: 3, supervisor: 2, chemist: 1 };

/** The wider role first; then the team whose name sorts first; then the lower id. */
function widerFirst(a: TeamMembership, b: TeamMembership): number {
  return (
    ROLE_WIDTH[b.role] - ROLE_WIDTH[a.role] ||
    a.teamName.localeCompare(b.teamName) ||
    (a.teamId < b.teamId ? -1 : a.teamId > b.teamId ? 1 : 0)
  );
}

/**
 * The team where the person holds their widest role; among equally wide ones the team whose name
 * sorts first, then the lower id, so the answer never depends on the order memberships were read in.
 * Undefined for a person in no team.
 */
export function defaultTeamId(actor: Pick<Actor, "memberships">): string | undefined {
  return [...actor.memberships].sort(widerFirst)[0]?.teamId;
}
