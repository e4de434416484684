// The public shape of the signed-in person, shared by /api/me and /api/session.
import type { Actor } from "@/lib/auth/actor";

export function toMe(actor: Actor) {
  return {
    id: actor.id,
    email: actor.email,
    name: actor.name,
    teams: actor.memberships.map((m) => ({ id: m.teamId, name: m.teamName, role: m.role })),
  };
}
