// Invitations by e-mail (send, resend, revoke, the pending list) and joining a team through an
// invitation link. The members themselves are in team-members.ts.
import "server-only";
import type { Transaction } from "sequelize";
import { AppError, notFound } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import type { TeamRole } from "@/lib/auth/roles";
import { hashPassword } from "@/lib/auth/password";
import { hashToken, newSecretToken } from "@/lib/auth/secret-token";
import { sendMail } from "@/lib/mail/send-mail";
import { invitationMail, invitationRevokedMail } from "@/lib/mail/templates";
import { Invitation, Membership, Team, User, sequelize } from "@/models";
import { assertPasswordAcceptable, checkPasswordThrottled, normaliseEmail } from "./accounts";
import { recordAudit } from "./audit";

const INVITATION_DAYS = 7;
/** The pending list is for people, not an export: the newest this many. */
const PENDING_LIST_LIMIT = 200;

export interface PendingInvitation {
  id: string;
  email: string;
  role: TeamRole;
  /** Who sent it (last). */
  invitedByName: string;
  /** When it was last sent (ISO time): a resend renews it. */
  sentAt: string;
  expiresAt: string;
  /** Past its expiry: its link no longer works, but a resend renews it. */
  expired: boolean;
}

/** Invitations neither accepted nor revoked, newest first: expired ones too, so they can be resent. */
export async function fetchPendingInvitations(
  actor: Actor,
  teamId: string,
): Promise<PendingInvitation[]> {
  authorize(actor, "team.manageMembers", { teamId });
  const rows = await Invitation.findAll({
    where: { teamId, acceptedAt: null, revokedAt: null },
    include: [{ model: User, as: "invitedBy", attributes: ["name"] }],
    order: [
      ["updatedAt", "DESC"],
      ["id", "ASC"],
    ],
    limit: PENDING_LIST_LIMIT,
  });
  const now = Date.now();
  return rows.map((r) => ({
    id: r.id,
    email: r.email,
    role: r.role,
    invitedByName: (r.get("invitedBy") as User | null)?.name ?? "",
    sentAt: r.updatedAt.toISOString(),
    expiresAt: r.expiresAt.toISOString(),
    expired: r.expiresAt.getTime() < now,
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

/** Why a link does not open: each state has its own sentence (see `closedInvitationMessage`). */
export type ClosedInvitationState = "revoked" | "used" | "expired" | "unknown";

type InvitationLookup =
  | { state: "open"; invitation: Invitation & { team: Team } }
  | { state: ClosedInvitationState; teamName?: string; expiresAt?: Date };

/**
 * The invitation behind a link. A resent invitation has a new token, so the earlier link finds
 * nothing ("unknown") — the same answer as a made-up token.
 */
async function lookUpInvitation(token: string): Promise<InvitationLookup> {
  const invitation = await Invitation.findOne({
    where: { tokenHash: hashToken(token) },
    include: [{ model: Team, as: "team" }],
  });
  if (!invitation) return { state: "unknown" };
  const teamName = (invitation.get("team") as Team).name;
  if (invitation.revokedAt) return { state: "revoked", teamName };
  if (invitation.acceptedAt) return { state: "used", teamName };
  if (invitation.expiresAt.getTime() < Date.now()) {
    return { state: "expired", teamName, expiresAt: invitation.expiresAt };
  }
  return { state: "open", invitation: invitation as Invitation & { team: Team } };
}

/** The sentence a closed invitation link answers with, on its page and from the accept API. */
export function closedInvitationMessage(lookup: {
  state: ClosedInvitationState;
  teamName?: string;
  expiresAt?: Date;
}): string {
  const team = lookup.teamName ?? "the team";
  switch (lookup.state) {
    case "revoked":
      return `This invitation is not valid any more: a lab lead of ${team} revoked it. Ask them for a new one if you should still join.`;
    case "used":
      return `This invitation is not valid any more: it has already been used to join ${team}. Sign in instead.`;
    case "expired":
      return `This invitation is not valid any more: it expired on ${lookup.expiresAt?.toISOString().slice(0, 10)} (UTC). Ask a lab lead of ${team} to send it again.`;
    case "unknown":
      return "This invitation is not valid any more. If it was sent to you again, use the link in the newest message; otherwise ask your lab lead for a new one.";
  }
}

export async function describeInvitation(
  token: string,
): Promise<
  | { state: "open"; email: string; teamName: string; role: TeamRole; hasAccount: boolean }
  | { state: ClosedInvitationState; message: string }
> {
  const lookup = await lookUpInvitation(token);
  if (lookup.state !== "open")
    return { state: lookup.state, message: closedInvitationMessage(lookup) };
  const { invitation } = lookup;
  const user = await User.findOne({
    where: sequelize.where(sequelize.fn("lower", sequelize.col("email")), invitation.email),
  });
  return {
    state: "open",
    email: invitation.email,
    teamName: invitation.team.name,
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
  const lookup = await lookUpInvitation(input.token);
  if (lookup.state !== "open") throw new AppError("validation", closedInvitationMessage(lookup));
  const { invitation } = lookup;
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
    // Claimed only while still open under this very token: a revoke or a resend that landed after
    // the lookup above wins.
    const [claimed] = await Invitation.update(
      { acceptedAt: new Date() },
      {
        where: {
          id: invitation.id,
          tokenHash: invitation.tokenHash,
          acceptedAt: null,
          revokedAt: null,
        },
        transaction,
      },
    );
    if (claimed !== 1) {
      throw new AppError(
        "conflict",
        "This invitation was used, revoked or sent again a moment ago. Open the newest invitation link, or ask your lab lead.",
      );
    }
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

/** Loads an invitation for a lab lead's change, locked, and says why it cannot change any more. */
async function lockOpenInvitation(
  actor: Actor,
  invitationId: string,
  transaction: Transaction,
): Promise<Invitation & { team: Team }> {
  const invitation = await Invitation.findByPk(invitationId, {
    include: [{ model: Team, as: "team", required: true }],
    transaction,
    lock: { level: transaction.LOCK.UPDATE, of: Invitation },
  });
  if (!invitation) throw notFound("No such invitation.");
  authorize(actor, "team.manageMembers", { teamId: invitation.teamId });
  if (invitation.acceptedAt) {
    throw new AppError(
      "conflict",
      `${invitation.email} already accepted this invitation and is a member now: change their role or remove them from the team instead.`,
    );
  }
  if (invitation.revokedAt) {
    throw new AppError(
      "conflict",
      `The invitation to ${invitation.email} was already revoked. Send a new invitation if they should join.`,
    );
  }
  return invitation as Invitation & { team: Team };
}

/**
 * Sends an invitation again with a fresh link valid for another 7 days (lab leads only); the
 * earlier link stops working, because only the new token's hash is kept. Expired invitations
 * can be resent too.
 */
export async function resendInvitation(
  actor: Actor,
  invitationId: string,
): Promise<PendingInvitation> {
  const token = newSecretToken();
  const invitation = await sequelize.transaction(async (transaction) => {
    const found = await lockOpenInvitation(actor, invitationId, transaction);
    const before = {
      email: found.email,
      role: found.role,
      expiresAt: found.expiresAt.toISOString(),
    };
    await found.update(
      {
        tokenHash: hashToken(token),
        expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000),
        invitedById: actor.id,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        teamId: found.teamId,
        action: "invitation.resend",
        entity: "invitation",
        entityId: found.id,
        before,
        after: { email: found.email, role: found.role, expiresAt: found.expiresAt.toISOString() },
      },
      transaction,
    );
    return found;
  });
  try {
    await sendMail({
      to: invitation.email,
      ...invitationMail({
        teamName: invitation.team.name,
        role: invitation.role,
        inviterName: actor.name,
        token,
        resent: true,
      }),
    });
  } catch (error) {
    console.error("[emberline] A resent invitation could not be mailed:", error);
    throw new AppError(
      "unavailable",
      `The invitation to ${invitation.email} has a new link, but the mail server did not take the message, so it was not delivered. Resend it again in a moment.`,
      { retryAfterSeconds: 15 },
    );
  }
  return {
    id: invitation.id,
    email: invitation.email,
    role: invitation.role,
    invitedByName: actor.name,
    sentAt: invitation.updatedAt.toISOString(),
    expiresAt: invitation.expiresAt.toISOString(),
    expired: false,
  };
}

/** Revokes an invitation (lab leads only): its link answers that it was revoked; the invitee is told. */
export async function revokeInvitation(
  actor: Actor,
  invitationId: string,
): Promise<{ email: string }> {
  const invitation = await sequelize.transaction(async (transaction) => {
    const found = await lockOpenInvitation(actor, invitationId, transaction);
    await found.update({ revokedAt: new Date() }, { transaction });
    await recordAudit(
      {
        actorId: actor.id,
        teamId: found.teamId,
        action: "invitation.revoke",
        entity: "invitation",
        entityId: found.id,
        before: { email: found.email, role: found.role, expiresAt: found.expiresAt.toISOString() },
      },
      transaction,
    );
    return found;
  });
  try {
    await sendMail({
      to: invitation.email,
      ...invitationRevokedMail({ teamName: invitation.team.name, revokerName: actor.name }),
    });
  } catch (error) {
    // The revoke is committed and the link refuses already; the notice is a courtesy.
    console.error("[emberline] The revoked-invitation mail could not be sent:", error);
  }
  return { email: invitation.email };
}
