// A team's members: the list with roles, a lab lead's role changes and removals (each audited and
// e-mailed to the person), and the rule that a team always keeps at least one lab lead.
import "server-only";
import type { Transaction } from "sequelize";
import { AppError, forbidden, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import type { TeamRole } from "@/lib/auth/roles";
import { sendMail } from "@/lib/mail/send-mail";
import { memberRemovedMail, memberRoleChangedMail } from "@/lib/mail/templates";
import { Membership, MembershipRemoval, Team, User, sequelize } from "@/models";
import { recordAudit } from "./audit";

export interface TeamMember {
  userId: string;
  name: string;
  email: string;
  role: TeamRole;
  /** When the person joined the team (ISO time). */
  joinedAt: string;
}

function toMember(membership: Membership, user: User): TeamMember {
  return {
    userId: user.id,
    name: user.name,
    email: user.email,
    role: membership.role,
    joinedAt: membership.createdAt.toISOString(),
  };
}

export async function fetchTeamMembers(actor: Actor, teamId: string): Promise<TeamMember[]> {
  authorize(actor, "team.view", { teamId });
  const rows = await Membership.findAll({
    where: { teamId },
    include: [{ model: User, as: "user", attributes: ["id", "name", "email"] }],
  });
  return rows
    .map((m) => toMember(m, m.get("user") as User))
    .sort((a, b) => a.name.localeCompare(b.name));
}

/**
 * Locks the team's row for the rest of the transaction, so that role changes and removals in one
 * team happen one after the other (two lab leads demoting each other at once cannot leave none),
 * and loads the member the change is about.
 */
async function lockTeamAndMember(
  actor: Actor,
  teamId: string,
  userId: string,
  transaction: Transaction,
): Promise<{ team: Team; membership: Membership; user: User }> {
  const team = await Team.findByPk(teamId, { transaction, lock: transaction.LOCK.UPDATE });
  if (!team) throw notFound();
  // The actor's role was read at the start of the request; a lab lead demoted by another while this
  // request waited for the lock must not act on the old role.
  const own = await Membership.findOne({
    where: { teamId, userId: actor.id },
    attributes: ["role"],
    transaction,
  });
  if (own?.role !== "lab_lead") {
    throw forbidden("You are no longer a lab lead of this team, so nothing was changed.");
  }
  const membership = await Membership.findOne({ where: { teamId, userId }, transaction });
  const user = membership ? await User.findByPk(userId, { transaction }) : null;
  if (!membership || !user) throw notFound("This person is not a member of this team.");
  return { team, membership, user };
}

/** Refuses a change that would leave the team without a lab lead (the database refuses it too). */
async function assertAnotherLabLead(
  actor: Actor,
  team: Team,
  membership: Membership,
  user: User,
  change: "demote" | "remove",
  transaction: Transaction,
): Promise<void> {
  if (membership.role !== "lab_lead") return;
  const leads = await Membership.count({
    where: { teamId: team.id, role: "lab_lead" },
    transaction,
  });
  if (leads > 1) return;
  const self = user.id === actor.id;
  const who = self ? "You are" : `${user.name} is`;
  const what =
    change === "demote"
      ? `so ${self ? "your" : "their"} role cannot change`
      : `so ${self ? "you" : "they"} cannot be removed`;
  throw new AppError(
    "conflict",
    `${who} the only lab lead of ${team.name}, ${what}: a team always keeps at least one lab lead. ` +
      "Make another member lab lead first.",
    change === "demote" ? { fieldErrors: { role: ["The team's only lab lead."] } } : {},
  );
}

async function notify(what: string, mail: { to: string; subject: string; text: string }) {
  try {
    await sendMail(mail);
  } catch (error) {
    // The change is committed; a lost notice must not turn it into an error for the lab lead.
    console.error(`[emberline] The ${what} mail could not be sent:`, error);
  }
}

/**
 * Gives a member another role (lab leads only). Applies from the member's next request, because
 * memberships are read on every request. A change to the role the member already has writes nothing.
 */
export async function changeMemberRole(
  actor: Actor,
  input: { teamId: string; userId: string; role: TeamRole },
): Promise<TeamMember> {
  authorize(actor, "team.manageMembers", { teamId: input.teamId });
  const outcome = await sequelize.transaction(async (transaction) => {
    const { team, membership, user } = await lockTeamAndMember(
      actor,
      input.teamId,
      input.userId,
      transaction,
    );
    const from = membership.role;
    if (from === input.role) return { team, member: toMember(membership, user), from, user };
    if (input.role !== "lab_lead") {
      await assertAnotherLabLead(actor, team, membership, user, "demote", transaction);
    }
    await membership.update({ role: input.role }, { transaction });
    await recordAudit(
      {
        actorId: actor.id,
        teamId: team.id,
        action: "membership.update",
        entity: "membership",
        entityId: membership.id,
        before: { userId: user.id, email: user.email, name: user.name, role: from },
        after: { userId: user.id, email: user.email, name: user.name, role: input.role },
      },
      transaction,
    );
    return { team, member: toMember(membership, user), from, user };
  });
  if (outcome.from !== input.role) {
    await notify("role change", {
      to: outcome.user.email,
      ...memberRoleChangedMail({
        name: outcome.user.name,
        teamName: outcome.team.name,
        from: outcome.from,
        to: input.role,
        changedByName: actor.name,
      }),
    });
  }
  return outcome.member;
}

/**
 * Removes a person from the team (lab leads only; a lab lead may leave, unless the last one). The
 * removal is recorded, so the sessions and access tokens the person holds get 401 for this team's
 * records from their next request on; their other teams are untouched, and what they recorded in
 * this team stays.
 */
export async function removeMember(
  actor: Actor,
  input: { teamId: string; userId: string },
): Promise<TeamMember> {
  authorize(actor, "team.manageMembers", { teamId: input.teamId });
  const { team, user, removed } = await sequelize.transaction(async (transaction) => {
    const found = await lockTeamAndMember(actor, input.teamId, input.userId, transaction);
    await assertAnotherLabLead(
      actor,
      found.team,
      found.membership,
      found.user,
      "remove",
      transaction,
    );
    const removedMember = toMember(found.membership, found.user);
    await found.membership.destroy({ transaction });
    await MembershipRemoval.create(
      {
        teamId: found.team.id,
        userId: found.user.id,
        role: found.membership.role,
        removedById: actor.id,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        teamId: found.team.id,
        action: "membership.delete",
        entity: "membership",
        entityId: found.membership.id,
        before: {
          userId: found.user.id,
          email: found.user.email,
          name: found.user.name,
          role: found.membership.role,
          joinedAt: removedMember.joinedAt,
        },
      },
      transaction,
    );
    return { ...found, removed: removedMember };
  });
  await notify("removal", {
    to: user.email,
    ...memberRemovedMail({ name: user.name, teamName: team.name, removedByName: actor.name }),
  });
  return removed;
}
