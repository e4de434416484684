// Sign-in with throttling, loading the signed-in person, password change and password reset.
import "server-only";
import { Op } from "sequelize";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import { dummyPasswordHash, hashPassword, passwordProblems, verifyPassword } from "@/lib/auth/password";
import { hashToken, newSecretToken } from "@/lib/auth/secret-token";
import { sendMail } from "@/lib/mail/send-mail";
import { passwordResetMail } from "@/lib/mail/templates";
import { AccessToken, Membership, PasswordResetToken, SignInAttempt, Team, User, sequelize } from "@/models";
import { recordAudit } from "./audit";
import { revokeSessionsOf } from "./sessions";

export const THROTTLE_WINDOW_MINUTES = 15;
export const MAX_FAILURES_PER_ACCOUNT = 5;
export const MAX_FAILURES_PER_ADDRESS = 20;
const RESET_TOKEN_HOURS = 1;

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

async function assertNotThrottled(email: string, address: string): Promise<void> {
  const since = new Date(Date.now() - THROTTLE_WINDOW_MINUTES * 60_000);
  const [byAccount, byAddress] = await Promise.all([
    SignInAttempt.count({ where: { email, succeeded: false, createdAt: { [Op.gte]: since } } }),
    SignInAttempt.count({ where: { address, succeeded: false, createdAt: { [Op.gte]: since } } }),
  ]);
  if (byAccount >= MAX_FAILURES_PER_ACCOUNT || byAddress >= MAX_FAILURES_PER_ADDRESS) {
    throw new AppError(
      "rate_limited",
      `Too many failed sign-ins. Wait ${THROTTLE_WINDOW_MINUTES} minutes and try again, or reset your password.`,
      { retryAfterSeconds: THROTTLE_WINDOW_MINUTES * 60 },
    );
  }
}

/** Checks e-mail and password; the same generic error for a wrong password and an unknown account. */
export async function signIn(input: { email: string; password: string; address: string }): Promise<Actor> {
  const email = normaliseEmail(input.email);
  await assertNotThrottled(email, input.address);
  const user = await User.findOne({ where: sequelize.where(sequelize.fn("lower", sequelize.col("email")), email) });
  let valid = false;
  if (user) valid = await verifyPassword(user.passwordHash, input.password);
  // The same work as a real check, so the reply time does not reveal unknown accounts.
  else await verifyPassword(await dummyPasswordHash(), input.password);
  await SignInAttempt.create({ email, address: input.address, succeeded: valid });
  if (!user || !valid) throw new AppError("unauthenticated", "The e-mail address or password is not right.");
  await recordAudit({ actorId: user.id, action: "session.create", entity: "user", entityId: user.id });
  return (await loadActor(user.id))!;
}

export async function loadActor(userId: string): Promise<Actor | null> {
  const user = await User.findByPk(userId, {
    include: [{ model: Membership, as: "memberships", include: [{ model: Team, as: "team" }] }],
  });
  if (!user) return null;
  const memberships = (user.get("memberships") as (Membership & { team: Team })[]) ?? [];
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    memberships: memberships
      .map((m) => ({ teamId: m.teamId, teamName: m.team.name, role: m.role }))
      .sort((a, b) => a.teamName.localeCompare(b.teamName)),
  };
}

/** Resolves a personal access token to its owner, or null when unknown or revoked. */
export async function actorFromAccessToken(token: string): Promise<Actor | null> {
  const row = await AccessToken.findOne({ where: { tokenHash: hashToken(token), revokedAt: null } });
  if (!row) return null;
  // Recording use at most once a minute keeps scripts from writing on every request.
  if (!row.lastUsedAt || Date.now() - row.lastUsedAt.getTime() > 60_000) {
    await row.update({ lastUsedAt: new Date() });
  }
  return loadActor(row.userId);
}

function assertPasswordAcceptable(password: string, email?: string, field = "password"): void {
  const problems = passwordProblems(password, email);
  if (problems.length) {
    throw new AppError("validation", problems[0], { fieldErrors: { [field]: problems } });
  }
}

/** Changes the password and ends the person's other sessions (all but `keepSessionId`). */
export async function changePassword(
  actor: Actor,
  input: { currentPassword: string; newPassword: string },
  options: { keepSessionId?: string } = {},
): Promise<void> {
  authorize(actor, "self.changePassword", { userId: actor.id });
  const user = await User.findByPk(actor.id);
  if (!user || !(await verifyPassword(user.passwordHash, input.currentPassword))) {
    throw new AppError("validation", "The current password is not right.", {
      fieldErrors: { currentPassword: ["The current password is not right."] },
    });
  }
  assertPasswordAcceptable(input.newPassword, user.email, "newPassword");
  const passwordHash = await hashPassword(input.newPassword);
  await sequelize.transaction(async (transaction) => {
    await user.update({ passwordHash }, { transaction });
    await revokeSessionsOf(user.id, { except: options.keepSessionId, transaction });
    await recordAudit({ actorId: actor.id, action: "password.change", entity: "user", entityId: actor.id }, transaction);
  });
}

/** Always succeeds from the caller's point of view, so it cannot be used to find accounts. */
export async function requestPasswordReset(input: { email: string }): Promise<void> {
  const email = normaliseEmail(input.email);
  const user = await User.findOne({ where: sequelize.where(sequelize.fn("lower", sequelize.col("email")), email) });
  if (!user) return;
  const token = newSecretToken();
  await sequelize.transaction(async (transaction) => {
    // Only the newest link works: older unused ones are retired.
    await PasswordResetToken.update(
      { usedAt: new Date() },
      { where: { userId: user.id, usedAt: null }, transaction },
    );
    await PasswordResetToken.create(
      {
        userId: user.id,
        tokenHash: hashToken(token),
        expiresAt: new Date(Date.now() + RESET_TOKEN_HOURS * 3_600_000),
        usedAt: null,
      },
      { transaction },
    );
    await recordAudit({ actorId: user.id, action: "password.resetRequest", entity: "user", entityId: user.id }, transaction);
  });
  await sendMail({ to: user.email, ...passwordResetMail({ name: user.name, token }) });
}

export async function resetPassword(input: { token: string; password: string }): Promise<void> {
  const row = await PasswordResetToken.findOne({ where: { tokenHash: hashToken(input.token) } });
  if (!row || row.usedAt || row.expiresAt.getTime() < Date.now()) {
    throw new AppError("validation", "This reset link is not valid any more. Ask for a new one.", {
      fieldErrors: { token: ["This reset link is not valid any more."] },
    });
  }
  const user = await User.findByPk(row.userId);
  if (!user) throw new AppError("validation", "This reset link is not valid any more.");
  assertPasswordAcceptable(input.password, user.email);
  const passwordHash = await hashPassword(input.password);
  await sequelize.transaction(async (transaction) => {
    const [updated] = await PasswordResetToken.update(
      { usedAt: new Date() },
      { where: { id: row.id, usedAt: null }, transaction },
    );
    if (updated !== 1) throw new AppError("validation", "This reset link has already been used.");
    await user.update({ passwordHash }, { transaction });
    await revokeSessionsOf(user.id, { transaction });
    await recordAudit({ actorId: user.id, action: "password.reset", entity: "user", entityId: user.id }, transaction);
  });
}

export { assertPasswordAcceptable };
