// The one policy: who may do what. Every service asks `authorize` (or `can`) before it acts.
// A person outside a team gets "not found" for its resources, never "forbidden", so that the
// existence of another team's data is not revealed.
import { AppError, notFound, forbidden } from "../errors";
import { roleIn, type Actor } from "./actor";
import type { TeamRole } from "./roles";

/** Actions on a team's resources, with the roles that may take them. */
const TEAM_ACTIONS = {
  "team.view": ["chemist", "supervisor", "lab_lead"],
  "team.manageMembers": ["lab_lead"],
  "team.readMailbox": ["lab_lead"],
  "instrument.view": ["chemist", "supervisor", "lab_lead"],
  "instrument.manage": ["lab_lead"],
  "spectrum.upload": ["chemist", "supervisor", "lab_lead"],
  "calibration.create": ["chemist", "supervisor", "lab_lead"],
  "notebook.create": ["chemist", "supervisor", "lab_lead"],
  "run.create": ["chemist", "supervisor", "lab_lead"],
  /** Notes, overrides, submission and amendment; the services also require the run's author. */
  "run.edit": ["chemist", "supervisor", "lab_lead"],
  "run.review": ["supervisor"],
  "lines.view": ["chemist", "supervisor", "lab_lead"],
  "lines.edit": ["lab_lead"],
  "lines.publish": ["lab_lead"],
  "audit.view": ["chemist", "supervisor", "lab_lead"],
  /** Recomputing the trail's hash chain (GET /api/audit/verify). */
  "audit.verify": ["lab_lead"],
} as const satisfies Record<string, readonly TeamRole[]>;

export type TeamAction = keyof typeof TEAM_ACTIONS;

/** Actions on a person's own things (tokens, password). */
export type SelfAction = "self.manageTokens" | "self.changePassword";

export type Action = TeamAction | SelfAction;

export type Resource = { teamId: string } | { userId: string };

export function can(actor: Actor | null, action: Action, resource: Resource): boolean {
  if (!actor) return false;
  if ("userId" in resource) {
    return (
      (action === "self.manageTokens" || action === "self.changePassword") &&
      resource.userId === actor.id
    );
  }
  const role = roleIn(actor, resource.teamId);
  if (!role || !(action in TEAM_ACTIONS)) return false;
  return (TEAM_ACTIONS[action as TeamAction] as readonly TeamRole[]).includes(role);
}

/**
 * Throws not-found for outsiders and forbidden for members without the right role; a person removed
 * from the team since this request's session or token was issued gets 401 with the reason, so the
 * credential visibly stops working for that team (it still works for their other teams).
 */
export function authorize(actor: Actor, action: Action, resource: Resource): void {
  if (can(actor, action, resource)) return;
  if ("teamId" in resource && !roleIn(actor, resource.teamId)) {
    if (actor.removedFrom?.includes(resource.teamId)) throw removedFromTeam();
    throw notFound();
  }
  if ("userId" in resource && resource.userId !== actor.id) throw notFound();
  throw forbidden();
}

function removedFromTeam(): AppError {
  return new AppError(
    "unauthenticated",
    "A lab lead removed you from this team, so this session or access token no longer opens its records. " +
      "Your other teams are not affected; ask a lab lead of this team if you need access again.",
  );
}

export const ROLES_FOR: Readonly<Record<TeamAction, readonly TeamRole[]>> = TEAM_ACTIONS;
