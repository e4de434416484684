// What the signed-in shell needs: the person, their current team and the areas they can reach.
import "server-only";
import { redirect } from "next/navigation";
import type { Actor, TeamMembership } from "@/lib/auth/actor";
import { currentActor, currentTeamId } from "@/lib/auth/session";
import { canReadMailbox } from "./mailbox";

export interface Workspace {
  actor: Actor;
  team: TeamMembership | undefined;
  canReadMail: boolean;
}

/** For pages: the workspace, or a redirect to sign-in. */
export async function requireWorkspace(): Promise<Workspace> {
  const actor = await currentActor();
  if (!actor) redirect("/sign-in");
  const teamId = await currentTeamId(actor);
  return {
    actor,
    team: actor.memberships.find((m) => m.teamId === teamId),
    canReadMail: canReadMailbox(actor),
  };
}
