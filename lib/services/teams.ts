// Teams and their members; invitations by e-mail and joining through an invitation link.
import "server-only";
import { Op } from "sequelize";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import type { TeamRole } from "@/lib/auth/roles";
import { hashPassword } from "@/lib/auth/password";
import { hashToken, newSecretToken } from "@/lib/auth/secret-token";
import { sendMail } from "@/lib/mail/send-mail";
import { invitationMail } from "@/lib/mail/templates";
import { Invitation, Membership, Team, User, sequelize } from "@/models";
import { assertPasswordAcceptable, checkPasswordThrottled, normaliseEmail } from "./accounts";
import { recordAudit } from "./audit";

const INVITATION_DAYS = 7;

export interface TeamMember {
  userId: string;
  name: string;
  email: string;
  role: TeamRole;
}

export interface PendingInvitation {
  id: string;
  email: string;
  role: TeamRole;
  expiresAt: string;
}

export async function fetchTeamMembers(actor: Actor, teamId: string): Promise<TeamMember[]> {
  authorize(actor, "team.view", { teamId });
  const rows = await Membership.findAll({
    where: { teamId },
    include: [{ model: User, as: "user", attributes: ["id", "name", "email"] }],
  });
  return rows
    .map((m) => {
      const user = m.get("user") as User;
      return { userId: user.id, name: user.name, email: user.email, role: m.role };
    })
    .sort((a, b) => a.name.localeCompare(b.name));
}

export async function fetchPendingInvitations(
  actor: Actor,
  teamId: string,
): Promise<PendingInvitation[]> {
  authorize(actor, "team.manageMembers", { teamId });
  const rows = await Invitation.findAll({
    where: { teamId, acceptedAt: null, revokedAt: null, expiresAt: { [Op.gt]: new Date() } },
    order: [["createdAt", "DESC"]],
  });
  return rows.map((r) => ({
    id: r.id,
    email: r.email,
    role: r.role,
    expiresAt: r.expiresAt.toISOString(),
  }));
}

export async function inviteMember(
  actor: Actor,
  input: { teamId: string; email: string; role: TeamRole },
): Promise<{ id: string }> {
  authorize(actor, "team.manageMembers", { teamId: input.teamId });
  const email = normaliseEmail(input.email);
  const team = await Team.findByPk(input.teamId);
  if (!team) throw notFound();
  const existing = await Membership.findOne({
    where: { teamId: team.id },
    include: [
      {
        model: User,
        as: "user",
        where: sequelize.where(sequelize.fn("lower", sequelize.col("user.email")), email),
      },
    ],
  });
  if (existing) {
    throw new AppError("conflict", `${email} is already a member of ${team.name}.`, {
      fieldErrors: { email: ["Already a member of this team."] },
    });
  }
  const token = newSecretToken();
  const invitation = await sequelize.transaction(async (transaction) => {
    const created = await Invitation.create(
      {
        teamId: team.id,
        email,
        role: input.role,
        tokenHash: hashToken(token),
        invitedById: actor.id,
        expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000),
        acceptedAt: null,
        revokedAt: null,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        teamId: team.id,
        action: "invitation.create",
        entity: "invitation",
        entityId: created.id,
        after: { email, role: input.role },
      },
      transaction,
    );
    return created;
  });
  await sendMail({
    to: email,
    ...invitationMail({ teamName: team.name, role: input.role, inviterName: actor.name, token }),
  });
  return { id: invitation.id };
}

async function findOpenInvitation(token: string) {
  const invitation = await Invitation.findOne({
    where: { tokenHash: hashToken(token) },
    include: [{ model: Team, as: "team" }],
  });
  if (
    !invitation ||
    invitation.acceptedAt ||
    invitation.revokedAt ||
    invitation.expiresAt.getTime() < Date.now()
  ) {
    return null;
  }
  return invitation;
}

export async function describeInvitation(
  token: string,
): Promise<{ email: string; teamName: string; role: TeamRole; hasAccount: boolean } | null> {
  const invitation = await findOpenInvitation(token);
  if (!invitation) return null;
  const user = await User.findOne({
    where: sequelize.where(sequelize.fn("lower", sequelize.col("email")), invitation.email),
  });
  return {
    email: invitation.email,
    teamName: (invitation.get("team") as Team).name,
    role: invitation.role,
    hasAccount: Boolean(user),
  };
}

/** Joins the team: creates the account (new person) or checks the password (existing account). */
export async function acceptInvitation(input: {
  token: string;
  name?: string;
  password: string;
  /** The client's address, for the password throttle when the account exists. */
  address: string;
}): Promise<string> {
  const invitation = await findOpenInvitation(input.token);
  if (!invitation) {
    throw new AppError(
      "validation",
      "This invitation is not valid any more. Ask your lab lead for a new one.",
    );
  }
  let user = await User.findOne({
    where: sequelize.where(sequelize.fn("lower", sequelize.col("email")), invitation.email),
  });
  if (user) {
    const valid = await checkPasswordThrottled({
      email: user.email,
      password: input.password,
      address: input.address,
      passwordHash: user.passwordHash,
    });
    if (!valid) {
      throw new AppError("validation", "The password is not right for this account.", {
        fieldErrors: { password: ["The password is not right for this account."] },
      });
    }
  } else {
    const name = input.name?.trim();
    if (!name)
      throw new AppError("validation", "Enter your name.", {
        fieldErrors: { name: ["Enter your name."] },
      });
    assertPasswordAcceptable(input.password, invitation.email);
  }
  const passwordHash = user ? null : await hashPassword(input.password);
  return sequelize.transaction(async (transaction) => {
    const [claimed] = await Invitation.update(
      { acceptedAt: new Date() },
      { where: { id: invitation.id, acceptedAt: null }, transaction },
    );
    if (claimed !== 1) throw new AppError("conflict", "This invitation has already been used.");
    if (!user) {
      user = await User.create(
        { email: invitation.email, name: input.name!.trim(), passwordHash: passwordHash! },
        { transaction },
      );
      await recordAudit(
        {
          actorId: user.id,
          teamId: invitation.teamId,
          action: "user.create",
          entity: "user",
          entityId: user.id,
          after: { email: user.email, name: user.name },
        },
        transaction,
      );
    }
    const membership = await Membership.create(
      { userId: user.id, teamId: invitation.teamId, role: invitation.role },
      { transaction },
    );
    await recordAudit(
      {
        actorId: user.id,
        teamId: invitation.teamId,
        action: "membership.create",
        entity: "membership",
        entityId: membership.id,
        after: { userId: user.id, role: invitation.role, invitationId: invitation.id },
      },
      transaction,
    );
    return user.id;
  });
}
