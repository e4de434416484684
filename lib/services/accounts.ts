// Sign-in and every other password check under one throttle, loading the signed-in person,
// password change and password reset (both end every session and access token of the person).
import "server-only";
import { Op, QueryTypes, type Transaction } from "sequelize";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize } from "@/lib/auth/policy";
import {
  dummyPasswordHash,
  hashPassword,
  passwordProblems,
  verifyPassword,
} from "@/lib/auth/password";
import { hashToken, newSecretToken } from "@/lib/auth/secret-token";
import {
  THROTTLE,
  describeWait,
  passwordCheckWaitSeconds,
  throttleAddressKey,
  type PasswordCheckHistory,
} from "@/lib/auth/throttle-rules";
import { sendMail } from "@/lib/mail/send-mail";
import { passwordResetMail } from "@/lib/mail/templates";
import {
  AccessToken,
  Membership,
  MembershipRemoval,
  PasswordResetToken,
  SignInAttempt,
  Team,
  User,
  sequelize,
} from "@/models";
import { recordAudit } from "./audit";
import { revokeSessionsOf } from "./sessions";

const RESET_TOKEN_HOURS = 1;

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

// ---------------------------------------------------------------------------------------------
// The one password throttle (rules in lib/auth/throttle-rules.ts), used by every password check:
// sign-in, password change, signing a run, joining a team with an existing account.

function throttled(seconds: number, what = "failed password attempts"): AppError {
  return new AppError(
    "rate_limited",
    `Too many ${what} from here. Try again in ${describeWait(seconds)}, or reset your password by e-mail.`,
    { retryAfterSeconds: seconds },
  );
}

async function passwordCheckHistory(
  email: string,
  address: string,
  now: Date,
): Promise<PasswordCheckHistory> {
  const pairSince = new Date(now.getTime() - THROTTLE.pairMemoryHours * 3_600_000);
  const knownSince = new Date(now.getTime() - THROTTLE.knownAddressDays * 86_400_000);
  const addressSince = new Date(now.getTime() - THROTTLE.addressWindowMinutes * 60_000);
  const pairSuccess = { email, address, kind: "password", succeeded: true };
  const [lastPairSuccessAt, lastUnlockAt, lastUnlockHereAt, addressFailures] = await Promise.all([
    SignInAttempt.max<Date | null, SignInAttempt>("createdAt", {
      where: { ...pairSuccess, createdAt: { [Op.gte]: knownSince } },
    }),
    SignInAttempt.max<Date | null, SignInAttempt>("createdAt", {
      where: { email, kind: "unlock", createdAt: { [Op.gte]: pairSince } },
    }),
    SignInAttempt.max<Date | null, SignInAttempt>("createdAt", {
      where: { email, address, kind: "unlock", createdAt: { [Op.gte]: knownSince } },
    }),
    SignInAttempt.findAll({
      where: { address, kind: "password", succeeded: false, createdAt: { [Op.gte]: addressSince } },
      attributes: ["createdAt"],
      order: [["createdAt", "DESC"]],
      limit: THROTTLE.maxFailuresPerAddress,
    }),
  ]);
  // A pair's failures count from the later of its last success, the account's last unlock and the memory limit.
  const clearedAt = [lastPairSuccessAt, lastUnlockAt, pairSince]
    .filter((d): d is Date => d instanceof Date)
    .reduce((a, b) => (a > b ? a : b));
  const where = {
    email,
    address,
    kind: "password",
    succeeded: false,
    createdAt: { [Op.gt]: clearedAt },
  };
  const [pairFailures, lastPairFailureAt] = await Promise.all([
    SignInAttempt.count({ where }),
    SignInAttempt.max<Date | null, SignInAttempt>("createdAt", { where }),
  ]);
  return {
    pairFailures,
    lastPairFailureAt: lastPairFailureAt ?? null,
    addressFailureTimes: addressFailures.map((row) => row.createdAt),
    knownAddress: Boolean(lastPairSuccessAt || lastUnlockHereAt),
  };
}

// Checks in flight in this process: a burst of parallel guesses for one pair (or from one address)
// would all pass the count before any failure is written, and each costs 64 MiB of argon2.
const checksInFlight = new Map<string, number>();

function takeSlot(key: string, limit: number): boolean {
  const running = checksInFlight.get(key) ?? 0;
  if (running >= limit) return false;
  checksInFlight.set(key, running + 1);
  return true;
}

function releaseSlot(key: string): void {
  const running = (checksInFlight.get(key) ?? 1) - 1;
  if (running > 0) checksInFlight.set(key, running);
  else checksInFlight.delete(key);
}

/**
 * Checks a password against `passwordHash` (null: no such account, checked against a dummy hash so
 * the time is the same) under the throttle, and records the outcome. Throws 429 with Retry-After
 * while the (account, address) pair or the address must wait; answers whether the password is right.
 */
export async function checkPasswordThrottled(input: {
  email: string;
  password: string;
  address: string;
  passwordHash: string | null;
}): Promise<boolean> {
  const email = normaliseEmail(input.email);
  const address = throttleAddressKey(input.address);
  const pairKey = `pair\n${email}\n${address}`;
  const addressKey = `address\n${address}`;
  if (!takeSlot(pairKey, THROTTLE.concurrentChecksPerPair))
    throw throttled(1, "password checks at once");
  if (!takeSlot(addressKey, THROTTLE.concurrentChecksPerAddress)) {
    releaseSlot(pairKey);
    throw throttled(1, "password checks at once");
  }
  try {
    const wait = passwordCheckWaitSeconds(
      await passwordCheckHistory(email, address, new Date()),
      new Date(),
    );
    if (wait > 0) throw throttled(wait);
    let valid = false;
    if (input.passwordHash) valid = await verifyPassword(input.passwordHash, input.password);
    // The same work as a real check, so the reply time does not reveal unknown accounts.
    else await verifyPassword(await dummyPasswordHash(), input.password);
    await SignInAttempt.create({ email, address, kind: "password", succeeded: valid });
    return valid;
  } finally {
    releaseSlot(addressKey);
    releaseSlot(pairKey);
  }
}

/**
 * The signed-in person's own password, re-entered to change it or to sign a run, checked under the
 * throttle exactly as at sign-in (a wrong one counts as a failed sign-in). Throws 401 when the person
 * no longer exists; answers the person and whether the password is right.
 */
export async function checkOwnPassword(
  actor: Actor,
  password: string,
  address: string,
): Promise<{ user: User; valid: boolean }> {
  const user = await User.findByPk(actor.id);
  if (!user) throw new AppError("unauthenticated", "Sign in first.");
  const valid = await checkPasswordThrottled({
    email: user.email,
    password,
    address,
    passwordHash: user.passwordHash,
  });
  return { user, valid };
}

function findUserByEmail(email: string) {
  return User.findOne({
    where: sequelize.where(sequelize.fn("lower", sequelize.col("email")), normaliseEmail(email)),
  });
}

/** Checks e-mail and password; the same generic error for a wrong password and an unknown account. */
export async function signIn(input: {
  email: string;
  password: string;
  address: string;
}): Promise<Actor> {
  const email = normaliseEmail(input.email);
  const user = await findUserByEmail(email);
  const valid = await checkPasswordThrottled({
    ...input,
    email,
    passwordHash: user?.passwordHash ?? null,
  });
  if (!user || !valid)
    throw new AppError("unauthenticated", "The e-mail address or password is not right.");
  await recordAudit({
    actorId: user.id,
    action: "session.create",
    entity: "user",
    entityId: user.id,
  });
  return (await loadActor(user.id))!;
}

/**
 * The person with their memberships as they are now: read on every request, so a removal or a role
 * change takes effect on the very next one. With `credentialIssuedAt` (the session's or access
 * token's creation), also the teams the person was removed from since then.
 */
export async function loadActor(
  userId: string,
  options: { credentialIssuedAt?: Date } = {},
): Promise<Actor | null> {
  const issuedAt = options.credentialIssuedAt;
  const [user, removals] = await Promise.all([
    User.findByPk(userId, {
      attributes: ["id", "email", "name"],
      include: [
        {
          model: Membership,
          as: "memberships",
          attributes: ["teamId", "role"],
          include: [{ model: Team, as: "team", attributes: ["id", "name"] }],
        },
      ],
    }),
    issuedAt
      ? MembershipRemoval.findAll({
          where: { userId, removedAt: { [Op.gte]: issuedAt } },
          attributes: ["teamId"],
        })
      : Promise.resolve([]),
  ]);
  if (!user) return null;
  const memberships = (user.get("memberships") as (Membership & { team: Team })[]) ?? [];
  const memberOf = new Set(memberships.map((m) => m.teamId));
  const removedFrom = [...new Set(removals.map((r) => r.teamId))].filter((t) => !memberOf.has(t));
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    memberships: memberships
      .map((m) => ({ teamId: m.teamId, teamName: m.team.name, role: m.role }))
      .sort((a, b) => a.teamName.localeCompare(b.teamName)),
    ...(removedFrom.length ? { removedFrom } : {}),
  };
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

interface SessionActorRow {
  id: string;
  email: string;
  name: string;
  team_id: string | null;
  team_name: string | null;
  role: Actor["memberships"][number]["role"] | null;
  removed_team_ids: string[];
}

/**
 * The person behind a live server-side session (not revoked, not expired) with their teams and the
 * teams they were removed from since it opened, in one statement: this runs on every
 * cookie-authenticated request, so the session check and the person's memberships share a round
 * trip, and the password hash is never read.
 */
export async function loadSessionActor(sessionId: string): Promise<Actor | null> {
  if (!UUID.test(sessionId)) return null;
  const rows = await sequelize.query<SessionActorRow>(
    `SELECT u.id, u.email, u.name, m.team_id, t.name AS team_name, m.role,
            ARRAY(SELECT DISTINCT r.team_id FROM membership_removals r
                   WHERE r.user_id = u.id AND r.removed_at >= s.created_at) AS removed_team_ids
       FROM user_sessions s
       JOIN users u ON u.id = s.user_id
       LEFT JOIN memberships m ON m.user_id = u.id
       LEFT JOIN teams t ON t.id = m.team_id
      WHERE s.id = :sessionId AND s.revoked_at IS NULL AND s.expires_at > now()`,
    { replacements: { sessionId }, type: QueryTypes.SELECT },
  );
  if (!rows.length) return null;
  const { id, email, name } = rows[0];
  const memberships = rows
    .filter((r) => r.team_id !== null && r.team_name !== null && r.role !== null)
    .map((r) => ({ teamId: r.team_id!, teamName: r.team_name!, role: r.role! }))
    .sort((a, b) => a.teamName.localeCompare(b.teamName));
  // Teams a lab lead removed the person from since this session opened (and not rejoined): see loadActor.
  const memberOf = new Set(memberships.map((m) => m.teamId));
  const removedFrom = rows[0].removed_team_ids.filter((teamId) => !memberOf.has(teamId));
  return { id, email, name, memberships, ...(removedFrom.length ? { removedFrom } : {}) };
}

/** Resolves a personal access token to its owner, or null when unknown or revoked. */
export async function actorFromAccessToken(token: string): Promise<Actor | null> {
  const row = await AccessToken.findOne({
    where: { tokenHash: hashToken(token), revokedAt: null },
  });
  if (!row) return null;
  // Recording use at most once a minute keeps scripts from writing on every request.
  if (!row.lastUsedAt || Date.now() - row.lastUsedAt.getTime() > 60_000) {
    await row.update({ lastUsedAt: new Date() });
  }
  return loadActor(row.userId, { credentialIssuedAt: row.createdAt });
}

function assertPasswordAcceptable(password: string, email?: string, field = "password"): void {
  const problems = passwordProblems(password, email);
  if (problems.length) {
    throw new AppError("validation", problems[0], { fieldErrors: { [field]: problems } });
  }
}

/** What a password change or reset ended, so the person can be told. */
export interface CredentialsRevoked {
  /** Sessions ended (other browsers; all of them after a reset). */
  sessions: number;
  /** Personal access tokens revoked: scripts using them must get new ones. */
  accessTokens: number;
}

/**
 * A new password means whoever knew the old one is out: every session (but `keepSessionId`) and
 * every access token of the person ends, in the caller's transaction.
 */
async function revokeCredentialsOf(
  userId: string,
  transaction: Transaction,
  keepSessionId?: string,
): Promise<CredentialsRevoked> {
  const sessions = await revokeSessionsOf(userId, { except: keepSessionId, transaction });
  const [accessTokens] = await AccessToken.update(
    { revokedAt: new Date() },
    { where: { userId, revokedAt: null }, transaction },
  );
  return { sessions, accessTokens };
}

/** Words for the person about what a new password ended (a reset ends every session, a change the others). */
export function describeRevoked(revoked: CredentialsRevoked, after: "reset" | "change"): string {
  const tokens =
    revoked.accessTokens === 0
      ? "You had no access tokens."
      : `Your ${revoked.accessTokens === 1 ? "access token was" : `${revoked.accessTokens} access tokens were`} revoked: ` +
        "scripts that used them need a new one (Account → Access tokens).";
  return `${after === "reset" ? "Every session was signed out." : "Your other sessions were signed out."} ${tokens}`;
}

/** Changes the password and ends the person's other sessions (all but `keepSessionId`) and every access token. */
export async function changePassword(
  actor: Actor,
  input: { currentPassword: string; newPassword: string },
  options: { keepSessionId?: string; address: string },
): Promise<CredentialsRevoked> {
  authorize(actor, "self.changePassword", { userId: actor.id });
  const { user, valid } = await checkOwnPassword(actor, input.currentPassword, options.address);
  if (!valid) {
    throw new AppError("validation", "The current password is not right.", {
      fieldErrors: { currentPassword: ["The current password is not right."] },
    });
  }
  assertPasswordAcceptable(input.newPassword, user.email, "newPassword");
  const passwordHash = await hashPassword(input.newPassword);
  return sequelize.transaction(async (transaction) => {
    await user.update({ passwordHash }, { transaction });
    const revoked = await revokeCredentialsOf(user.id, transaction, options.keepSessionId);
    await recordAudit(
      {
        actorId: actor.id,
        action: "password.change",
        entity: "user",
        entityId: actor.id,
        after: { revoked },
      },
      transaction,
    );
    return revoked;
  });
}

// Password-reset mail is sent in the background: the reply to a request does the same work
// whether or not the address has an account (count, record, answer), so its timing tells nothing.
const resetMailsPending = new Set<Promise<void>>();

function inBackground(task: () => Promise<void>): void {
  const running = task()
    .catch((error: unknown) => {
      process.stderr.write(
        `[emberline] a password-reset mail failed: ${error instanceof Error ? error.message : error}\n`,
      );
    })
    .finally(() => resetMailsPending.delete(running));
  resetMailsPending.add(running);
}

/**
 * Always answers alike, so it cannot be used to find accounts: 429 only when this address asked
 * too often (whatever the e-mail addresses), otherwise the request is recorded and a mail queued.
 */
export async function requestPasswordReset(input: {
  email: string;
  address: string;
}): Promise<void> {
  const email = normaliseEmail(input.email);
  const address = throttleAddressKey(input.address);
  const since = new Date(Date.now() - 3_600_000);
  const fromAddress = await SignInAttempt.count({
    where: { address, kind: "reset_request", createdAt: { [Op.gte]: since } },
  });
  if (fromAddress >= THROTTLE.resetRequestsPerAddressPerHour) {
    throw new AppError("rate_limited", "Too many reset requests from here. Try again in an hour.", {
      retryAfterSeconds: 3600,
    });
  }
  await SignInAttempt.create({ email, address, kind: "reset_request", succeeded: false });
  inBackground(() => sendResetLink(email, address));
}

/** Makes and mails a reset link, unless the account is unknown or had its few mails this hour. */
async function sendResetLink(email: string, address: string): Promise<void> {
  const token = newSecretToken();
  const user = await sequelize.transaction(async (transaction) => {
    // Locking the person's row makes parallel requests count each other's mails.
    const found = await User.findOne({
      where: sequelize.where(sequelize.fn("lower", sequelize.col("email")), email),
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!found) return null;
    const mailed = await SignInAttempt.count({
      where: {
        email,
        kind: "reset_mail",
        createdAt: { [Op.gte]: new Date(Date.now() - 3_600_000) },
      },
      transaction,
    });
    // The newest link mailed this hour still works, so the owner is not left without one.
    if (mailed >= THROTTLE.resetMailsPerAccountPerHour) return null;
    // Only the newest link works: older unused ones are retired.
    await PasswordResetToken.update(
      { usedAt: new Date() },
      { where: { userId: found.id, usedAt: null }, transaction },
    );
    await PasswordResetToken.create(
      {
        userId: found.id,
        tokenHash: hashToken(token),
        expiresAt: new Date(Date.now() + RESET_TOKEN_HOURS * 3_600_000),
        usedAt: null,
      },
      { transaction },
    );
    await SignInAttempt.create(
      { email, address, kind: "reset_mail", succeeded: true },
      { transaction },
    );
    await recordAudit(
      { actorId: found.id, action: "password.resetRequest", entity: "user", entityId: found.id },
      transaction,
    );
    return found;
  });
  if (user) await sendMail({ to: user.email, ...passwordResetMail({ name: user.name, token }) });
}

/**
 * Sets a new password with a mailed link; ends every session and access token of the person and
 * unlocks their password throttle (the link proves the mailbox, so the owner gets back in).
 */
export async function resetPassword(input: {
  token: string;
  password: string;
  address: string;
}): Promise<CredentialsRevoked> {
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
  return sequelize.transaction(async (transaction) => {
    const [updated] = await PasswordResetToken.update(
      { usedAt: new Date() },
      { where: { id: row.id, usedAt: null }, transaction },
    );
    if (updated !== 1) throw new AppError("validation", "This reset link has already been used.");
    await user.update({ passwordHash }, { transaction });
    const revoked = await revokeCredentialsOf(user.id, transaction);
    await SignInAttempt.create(
      {
        email: normaliseEmail(user.email),
        address: throttleAddressKey(input.address),
        kind: "unlock",
        succeeded: true,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: user.id,
        action: "password.reset",
        entity: "user",
        entityId: user.id,
        after: { revoked },
      },
      transaction,
    );
    return revoked;
  });
}

export { assertPasswordAcceptable };
