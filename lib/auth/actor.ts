// The signed-in person as every service sees them: identity and role per team.
import type { TeamRole } from "./roles";

export interface TeamMembership {
  teamId: string;
  teamName: string;
  role: TeamRole;
}

export interface Actor {
  id: string;
  email: string;
  name: string;
  memberships: TeamMembership[];
  /**
   * Teams a lab lead removed the person from after the session or access token of this request was
   * issued (and that they have not rejoined): that credential gets 401 for those teams' records.
   */
  removedFrom?: readonly string[];
}

export function roleIn(actor: Actor, teamId: string): TeamRole | undefined {
  return actor.memberships.find((m) => m.teamId === teamId)?.role;
}
