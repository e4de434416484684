// Checks and look-ups the review services share: who the team's supervisors are, and whether the
// actor may mark, return or sign a run now.
import "server-only";
import type { Transaction } from "sequelize";
import { AppError, forbidden } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { Membership, User, type Run } from "@/models";
import type { PersonRef } from "./run-review-types";

export const person = (user: User | null | undefined): PersonRef | null =>
  user ? { id: user.id, name: user.name } : null;

export async function supervisorsOf(
  teamId: string,
  transaction?: Transaction,
): Promise<{ id: string; name: string; email: string }[]> {
  const rows = await Membership.findAll({
    where: { teamId, role: "supervisor" },
    include: [{ model: User, as: "user", attributes: ["id", "name", "email"] }],
    transaction,
  });
  return rows
    .map((m) => m.get("user") as User)
    .map((u) => ({ id: u.id, name: u.name, email: u.email }))
    .sort((a, b) => a.name.localeCompare(b.name));
}

/** Why this actor cannot review the run now, or null; the role itself is checked by `authorize`. */
export function decideRefusal(
  actor: Actor,
  run: Pick<Run, "status" | "createdById">,
): AppError | null {
  if (run.createdById === actor.id)
    return forbidden(
      "A supervisor cannot review or sign their own run: another supervisor of the team must.",
    );
  if (run.status !== "submitted") {
    return new AppError(
      "conflict",
      run.status === "signed"
        ? "This run is already signed: it is never changed (amend it to make a new version)."
        : "This run is not waiting for review.",
    );
  }
  return null;
}

export function assertMayDecide(actor: Actor, run: Pick<Run, "status" | "createdById">): void {
  const refusal = decideRefusal(actor, run);
  if (refusal) throw refusal;
}
