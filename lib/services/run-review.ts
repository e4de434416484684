// Review and sign-off of runs: the author submits (optionally naming a supervisor), supervisors mark
// calls and lines, then return the run with a comment or sign it with their password, which records
// the meaning, signer, time and the SHA-256 of the run's content and locks the run for good. A signed
// run is amended by a new version that goes through review again. Every change locks the run's row
// (so two reviewers cannot both decide) and writes its audit event in the same transaction; mail goes
// out after the commit and a mail failure never undoes a decision.
import "server-only";
import { QueryTypes, UniqueConstraintError, type Transaction } from "sequelize";
import { AppError, forbidden } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { authorize, can } from "@/lib/auth/policy";
import { sendMail } from "@/lib/mail/send-mail";
import { runReturnedMail, runSubmittedMail } from "@/lib/mail/templates";
import type { Verdict } from "@/lib/spectrum/matching";
import type {
  ReviewDecisionInput,
  ReviewMarkInput,
  ReviewQueueQuery,
  SubmitRunInput,
} from "@/lib/validation/review-schemas";
import {
  Calibration,
  LineRelease,
  Membership,
  Run,
  RunOverride,
  RunReviewMark,
  RunRound,
  RunSignature,
  SpectrumFile,
  User,
  sequelize,
} from "@/models";
import { standingVerdicts } from "@/lib/runs/standing-verdicts";
import type { RunStatus } from "@/lib/runs/types";
import { checkPasswordThrottled } from "./accounts";
import { recordAudit } from "./audit";
import { buildRunContent, calibrationModelLabel, runContentHash } from "./run-content";
import { STATUS_LABEL, assertAuthorMayEdit, loadRun, lockReason } from "./run-lifecycle";
import { overridesByRun } from "./run-records";
import type { RunCall } from "./workflow-types";

/** What a signature says, recorded with it and shown beside it. */
export const SIGNATURE_MEANING = "Reviewed and approved";

export interface PersonRef {
  id: string;
  name: string;
}

export interface ReviewMarkRecord {
  id: string;
  round: number;
  reviewer: PersonRef | null;
  species: string;
  lineNm: number | null;
  agreement: "agree" | "disagree" | null;
  comment: string;
  at: string;
}

export interface ReviewRoundRecord {
  round: number;
  submittedBy: PersonRef | null;
  submittedAt: string;
  requestedReviewer: PersonRef | null;
  decision: "returned" | "signed" | null;
  decidedBy: PersonRef | null;
  decidedAt: string | null;
  comment: string;
  /** The author's reply, on submitting this round, to the comments of the round before. */
  reply: string;
  marks: ReviewMarkRecord[];
}

export interface SignatureRecord {
  round: number;
  signer: PersonRef;
  signerName: string;
  meaning: string;
  contentHash: string;
  signedAt: string;
}

export interface RunVersionRef {
  id: string;
  versionNumber: number;
  status: RunStatus;
  signedAt: string | null;
}

export interface RunHistory {
  runId: string;
  status: RunStatus;
  statusLabel: string;
  reviewRound: number;
  versionNumber: number;
  rounds: ReviewRoundRecord[];
  signature: SignatureRecord | null;
  /** Every version of the run, first to newest: the signed ones and their amendments. */
  versions: RunVersionRef[];
  amendsRunId: string | null;
  /** The amendment of this run, when it is signed and has been amended. */
  amendedById: string | null;
}

/** What the signed-in person may do about a run's review now, with the reason when they may not. */
export interface RunReviewState {
  runId: string;
  teamId: string;
  status: RunStatus;
  statusLabel: string;
  lockReason: string | null;
  isAuthor: boolean;
  maySubmit: boolean;
  isReviewer: boolean;
  mayDecide: boolean;
  /** Why a supervisor cannot mark, return or sign this run now; null when they can or are not a supervisor. */
  whyNotDecide: string | null;
  mayAmend: boolean;
  /** Supervisors of the team who may be named as reviewer (never the author). */
  reviewers: PersonRef[];
  history: RunHistory;
}

export interface ReviewQueueItem {
  runId: string;
  label: string;
  notebookTitle: string;
  author: PersonRef | null;
  instrument: { id: string; name: string };
  round: number;
  versionNumber: number;
  namedToMe: boolean;
  submittedAt: string;
  /** Seconds the run has waited since its submission, when the queue was read. */
  waitingSeconds: number;
  present: string[];
}

export interface ReviewQueue {
  items: ReviewQueueItem[];
  /** Everything waiting for the actor before the filters, for the navigation count. */
  total: number;
  /** The values the filters offer: those of the runs waiting, whatever the filters chose. */
  options: { authors: PersonRef[]; instruments: { id: string; name: string }[]; species: string[] };
}

// ---------------------------------------------------------------------------------------------
// Shared checks

const person = (user: User | null | undefined): PersonRef | null =>
  user ? { id: user.id, name: user.name } : null;

async function supervisorsOf(
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
function decideRefusal(actor: Actor, run: Pick<Run, "status" | "createdById">): AppError | null {
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

function assertMayDecide(actor: Actor, run: Pick<Run, "status" | "createdById">): void {
  const refusal = decideRefusal(actor, run);
  if (refusal) throw refusal;
}

function runLabel(spectrum: Pick<SpectrumFile, "label" | "fileName"> | null): string {
  return spectrum ? spectrum.label || spectrum.fileName : "run";
}

function teamNameOf(actor: Actor, teamId: string): string {
  return actor.memberships.find((m) => m.teamId === teamId)?.teamName ?? "your team";
}

async function send(
  what: string,
  mail: { to: string[]; subject: string; text: string },
): Promise<void> {
  if (mail.to.length === 0) return;
  try {
    await sendMail(mail);
  } catch (error) {
    console.error(`[emberline] The ${what} mail could not be sent:`, error);
  }
}

// ---------------------------------------------------------------------------------------------
// The content a signature covers

async function runContentOf(run: Run, transaction?: Transaction) {
  const [spectrum, calibration, release, overrides] = await Promise.all([
    SpectrumFile.findByPk(run.spectrumId, { attributes: ["id", "sha256"], transaction }),
    run.calibrationId
      ? Calibration.findByPk(run.calibrationId, {
          attributes: ["id", "model", "rmsNm"],
          transaction,
        })
      : null,
    LineRelease.findByPk(run.lineReleaseId, { attributes: ["id", "number"], transaction }),
    RunOverride.findAll({
      where: { runId: run.id },
      order: [
        ["createdAt", "ASC"],
        ["id", "ASC"],
      ],
      transaction,
    }),
  ]);
  return buildRunContent({
    run: {
      id: run.id,
      teamId: run.teamId,
      notebookId: run.notebookId,
      spectrumId: run.spectrumId,
      calibrationId: run.calibrationId,
      lineReleaseId: run.lineReleaseId,
      source: run.source,
      settings: run.settings,
      lampChecked: run.lampChecked,
      softwareVersion: run.softwareVersion,
      rangeMinNm: run.rangeMinNm,
      rangeMaxNm: run.rangeMaxNm,
      noiseCounts: run.noiseCounts,
      peaks: run.peaks,
      calls: run.calls,
      unexplained: run.unexplained,
      warnings: run.warnings,
      notes: run.notes,
      versionNumber: run.versionNumber,
      amendsRunId: run.amendsRunId,
      rerunOfId: run.rerunOfId,
      createdById: run.createdById,
    },
    spectrumSha256: spectrum!.sha256,
    calibration: calibration
      ? {
          id: calibration.id,
          model: calibrationModelLabel(calibration.model),
          rmsNm: calibration.rmsNm,
        }
      : null,
    lineRelease: { id: release!.id, number: release!.number },
    overrides: overrides.map((o) => ({
      id: o.id,
      species: o.species,
      computedVerdict: o.computedVerdict,
      verdict: o.verdict,
      reason: o.reason,
      createdById: o.createdById,
      createdAt: o.createdAt.toISOString(),
    })),
  });
}

/**
 * The SHA-256 of a run's content as it stands in the tables now, or null when there is no such run.
 * Unauthorised: for the audit chain's verifier, which compares it with what was signed.
 */
export async function recomputeRunContentHash(
  runId: string,
  transaction?: Transaction,
): Promise<string | null> {
  const run = await Run.findByPk(runId, { transaction });
  return run ? runContentHash(await runContentOf(run, transaction)) : null;
}

/** A run's canonical content and its SHA-256, as a signature would cover it now (for reports and checks). */
export async function fetchRunContent(
  actor: Actor,
  runId: string,
): Promise<{ content: Record<string, unknown>; contentHash: string }> {
  const run = await loadRun(actor, runId);
  const content = await runContentOf(run);
  return { content, contentHash: runContentHash(content) };
}

// ---------------------------------------------------------------------------------------------
// Submission

/**
 * A returned run goes back to review only when the author changed it (notes, overrides) or answered
 * the comments: the same content with no reply would ask the reviewer the same question again.
 */
async function assertChangedOrReplied(run: Run, reply: string, transaction: Transaction) {
  if (reply !== "") return;
  const returned = await RunRound.findOne({
    where: { runId: run.id, round: run.reviewRound },
    attributes: ["decision", "decidedContentHash"],
    transaction,
  });
  // Rounds returned before the hash was kept cannot be compared: a reply is asked for there too.
  if (returned?.decision !== "returned") return;
  const unchanged =
    returned.decidedContentHash === null ||
    returned.decidedContentHash === runContentHash(await runContentOf(run, transaction));
  if (!unchanged) return;
  throw new AppError(
    "unprocessable",
    "The run is unchanged since it was returned: reply to the reviewer's comments, or change the run, before submitting it again.",
    { fieldErrors: { reply: ["Say how you dealt with the reviewer's comments."] } },
  );
}

export async function submitRun(
  actor: Actor,
  runId: string,
  input: SubmitRunInput,
): Promise<RunHistory> {
  const submitted = await sequelize.transaction(async (transaction) => {
    const run = await loadRun(actor, runId, "run.edit", transaction);
    assertAuthorMayEdit(actor, run);
    const supervisors = (await supervisorsOf(run.teamId, transaction)).filter(
      (s) => s.id !== actor.id,
    );
    let recipients = supervisors;
    if (input.reviewerId) {
      const named = supervisors.find((s) => s.id === input.reviewerId);
      if (!named) {
        throw new AppError(
          "validation",
          "The reviewer must be a supervisor of the team other than the author.",
          {
            fieldErrors: { reviewerId: ["Choose a supervisor of the team other than yourself."] },
          },
        );
      }
      recipients = [named];
    }
    if (recipients.length === 0) {
      throw new AppError(
        "unprocessable",
        "The team has no supervisor who could review this run: ask the lab lead to add one.",
      );
    }
    const reply = input.reply ?? "";
    if (run.status === "returned") await assertChangedOrReplied(run, reply, transaction);
    const before = { status: run.status, round: run.reviewRound };
    const round = run.reviewRound + 1;
    await RunRound.create(
      {
        runId: run.id,
        round,
        submittedById: actor.id,
        requestedReviewerId: input.reviewerId ?? null,
        reply,
      },
      { transaction },
    );
    await run.update(
      {
        status: "submitted",
        reviewRound: round,
        requestedReviewerId: input.reviewerId ?? null,
        submittedAt: new Date(),
        lockVersion: run.lockVersion + 1,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        teamId: run.teamId,
        action: "run.submit",
        entity: "run",
        entityId: run.id,
        before,
        after: {
          status: "submitted",
          round,
          requestedReviewerId: input.reviewerId ?? null,
          ...(reply ? { reply } : {}),
        },
      },
      transaction,
    );
    const spectrum = await SpectrumFile.findByPk(run.spectrumId, {
      attributes: ["label", "fileName"],
      transaction,
    });
    return { run, round, recipients, label: runLabel(spectrum) };
  });
  await send("submission", {
    to: submitted.recipients.map((r) => r.email),
    ...runSubmittedMail({
      teamName: teamNameOf(actor, submitted.run.teamId),
      authorName: actor.name,
      runLabel: submitted.label,
      round: submitted.round,
      named: Boolean(input.reviewerId),
      runId: submitted.run.id,
    }),
  });
  return fetchRunHistory(actor, runId);
}

// ---------------------------------------------------------------------------------------------
// Marks on calls and lines

const LINE_MATCH_NM = 1e-6;

export async function addReviewMark(
  actor: Actor,
  runId: string,
  input: ReviewMarkInput,
): Promise<ReviewMarkRecord> {
  return sequelize.transaction(async (transaction) => {
    const run = await loadRun(actor, runId, "run.review", transaction);
    assertMayDecide(actor, run);
    const call = (run.calls as RunCall[]).find((c) => c.species === input.species);
    if (!call) {
      throw new AppError("validation", "This run has no call of that species.", {
        fieldErrors: { species: ["Choose one of the run's calls."] },
      });
    }
    const lineNm = input.lineNm ?? null;
    if (lineNm !== null) {
      const known = [...call.lines, ...call.missing].some(
        (l) => Math.abs(l.lineNm - lineNm) <= LINE_MATCH_NM,
      );
      if (!known) {
        throw new AppError(
          "validation",
          `No line at ${lineNm} nm belongs to the ${call.species} call.`,
          {
            fieldErrors: { lineNm: ["Choose one of the call's lines."] },
          },
        );
      }
    }
    const mark = await RunReviewMark.create(
      {
        runId: run.id,
        round: run.reviewRound,
        reviewerId: actor.id,
        species: call.species,
        lineNm,
        agreement: input.agreement ?? null,
        comment: input.comment,
      },
      { transaction },
    );
    await recordAudit(
      {
        actorId: actor.id,
        teamId: run.teamId,
        action: "run.review_mark",
        entity: "run",
        entityId: run.id,
        before: { status: run.status, round: run.reviewRound },
        after: {
          status: run.status,
          round: run.reviewRound,
          markId: mark.id,
          species: mark.species,
          lineNm: mark.lineNm,
          agreement: mark.agreement,
          comment: mark.comment,
        },
      },
      transaction,
    );
    return {
      id: mark.id,
      round: mark.round,
      reviewer: { id: actor.id, name: actor.name },
      species: mark.species,
      lineNm: mark.lineNm,
      agreement: mark.agreement,
      comment: mark.comment,
      at: mark.createdAt.toISOString(),
    };
  });
}

// ---------------------------------------------------------------------------------------------
// Decisions: return or sign

/**
 * The signer's password, checked under the one password throttle of lib/services/accounts.ts, so
 * the signing form cannot be used to guess a password past the sign-in throttle.
 */
async function assertSigningPassword(
  actor: Actor,
  password: string,
  address: string,
): Promise<void> {
  const user = await User.findByPk(actor.id, { attributes: ["id", "email", "passwordHash"] });
  if (!user) throw new AppError("unauthenticated", "Sign in first.");
  const valid = await checkPasswordThrottled({
    email: user.email,
    password,
    address,
    passwordHash: user.passwordHash,
  });
  if (!valid) {
    throw new AppError("unauthenticated", "The password is not right. Nothing was signed.", {
      fieldErrors: { password: ["The password is not right."] },
    });
  }
}

export async function reviewRun(
  actor: Actor,
  runId: string,
  input: ReviewDecisionInput,
  context: { address: string },
): Promise<RunHistory> {
  // Refuse early (role, authorship, state) without a lock, so a wrong password is only ever checked
  // for someone who could sign; everything is checked again under the row lock below.
  assertMayDecide(actor, await loadRun(actor, runId, "run.review"));
  if (input.decision === "sign")
    await assertSigningPassword(actor, input.password ?? "", context.address);

  const decided = await sequelize.transaction(async (transaction) => {
    const run = await loadRun(actor, runId, "run.review", transaction);
    assertMayDecide(actor, run);
    const round = await RunRound.findOne({
      where: { runId: run.id, round: run.reviewRound },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (!round || round.decision)
      throw new AppError("conflict", "This review round is already decided.");
    const before = { status: run.status, round: run.reviewRound };
    const now = new Date();
    if (input.decision === "return") {
      await round.update(
        {
          decision: "returned",
          decidedById: actor.id,
          decidedAt: now,
          comment: input.comment,
          decidedContentHash: runContentHash(await runContentOf(run, transaction)),
        },
        { transaction },
      );
      await run.update({ status: "returned", lockVersion: run.lockVersion + 1 }, { transaction });
      await recordAudit(
        {
          actorId: actor.id,
          teamId: run.teamId,
          action: "run.return",
          entity: "run",
          entityId: run.id,
          before,
          after: { status: "returned", round: run.reviewRound, comment: input.comment },
        },
        transaction,
      );
    } else {
      const contentHash = runContentHash(await runContentOf(run, transaction));
      await RunSignature.create(
        {
          runId: run.id,
          round: run.reviewRound,
          signerId: actor.id,
          signerName: actor.name,
          meaning: SIGNATURE_MEANING,
          contentHash,
          signedAt: now,
        },
        { transaction },
      );
      await round.update(
        { decision: "signed", decidedById: actor.id, decidedAt: now, comment: input.comment },
        { transaction },
      );
      await run.update(
        { status: "signed", signedAt: now, lockVersion: run.lockVersion + 1 },
        { transaction },
      );
      await recordAudit(
        {
          actorId: actor.id,
          teamId: run.teamId,
          action: "run.sign",
          entity: "run",
          entityId: run.id,
          before,
          after: {
            status: "signed",
            round: run.reviewRound,
            meaning: SIGNATURE_MEANING,
            signerName: actor.name,
            contentHash,
            comment: input.comment,
          },
        },
        transaction,
      );
    }
    const [author, spectrum] = await Promise.all([
      run.createdById
        ? User.findByPk(run.createdById, { attributes: ["name", "email"], transaction })
        : null,
      SpectrumFile.findByPk(run.spectrumId, { attributes: ["label", "fileName"], transaction }),
    ]);
    return { run, author, label: runLabel(spectrum) };
  });

  if (input.decision === "return" && decided.author) {
    await send("return", {
      to: [decided.author.email],
      ...runReturnedMail({
        authorName: decided.author.name,
        reviewerName: actor.name,
        runLabel: decided.label,
        round: decided.run.reviewRound,
        comment: input.comment,
        runId: decided.run.id,
      }),
    });
  }
  return fetchRunHistory(actor, runId);
}

// ---------------------------------------------------------------------------------------------
// Amendment of a signed run

/** A new draft version of a signed run: the same analysis, notes and standing overrides, linked to it. */
export async function amendRun(
  actor: Actor,
  runId: string,
): Promise<{ id: string; versionNumber: number; amendsRunId: string }> {
  try {
    return await sequelize.transaction(async (transaction) => {
      const signed = await loadRun(actor, runId, "run.edit", transaction, { withMatches: true });
      if (signed.status !== "signed") {
        throw new AppError(
          "conflict",
          "Only a signed run is amended; this one can still be changed by its author.",
        );
      }
      if (signed.createdById !== actor.id && !can(actor, "run.review", { teamId: signed.teamId })) {
        throw forbidden("Only the run's author or a supervisor of the team amends a signed run.");
      }
      const existing = await Run.findOne({
        where: { amendsRunId: signed.id },
        attributes: ["id", "versionNumber"],
        transaction,
      });
      if (existing)
        throw new AppError(
          "conflict",
          `This run already has an amendment (version ${existing.versionNumber}): amend that one once it is signed.`,
        );
      const amendment = await Run.create(
        {
          teamId: signed.teamId,
          notebookId: signed.notebookId,
          spectrumId: signed.spectrumId,
          calibrationId: signed.calibrationId,
          lineReleaseId: signed.lineReleaseId,
          source: signed.source,
          status: "draft",
          settings: signed.settings,
          lampChecked: signed.lampChecked,
          softwareVersion: signed.softwareVersion,
          rangeMinNm: signed.rangeMinNm,
          rangeMaxNm: signed.rangeMaxNm,
          noiseCounts: signed.noiseCounts,
          peaks: signed.peaks,
          matches: signed.matches,
          calls: signed.calls,
          peakOverlaps: signed.peakOverlaps,
          unexplained: signed.unexplained,
          warnings: signed.warnings,
          temperature: signed.temperature,
          continuum: signed.continuum,
          versionNumber: signed.versionNumber + 1,
          amendsRunId: signed.id,
          rerunOfId: signed.rerunOfId,
          notes: signed.notes,
          createdById: actor.id,
        },
        { transaction },
      );
      // The overrides that stand on the signed version stand on the amendment too (withdrawn ones do not).
      const overrides = await RunOverride.findAll({
        where: { runId: signed.id },
        order: [
          ["createdAt", "ASC"],
          ["id", "ASC"],
        ],
        transaction,
      });
      const newest = new Map<string, RunOverride>();
      for (const o of overrides) newest.set(o.species, o);
      const carried = [...newest.values()].filter((o) => o.verdict !== null);
      for (const o of carried) {
        await RunOverride.create(
          {
            runId: amendment.id,
            species: o.species,
            computedVerdict: o.computedVerdict,
            verdict: o.verdict,
            reason: o.reason,
            createdById: o.createdById,
          },
          { transaction },
        );
      }
      await recordAudit(
        {
          actorId: actor.id,
          teamId: signed.teamId,
          action: "run.amend",
          entity: "run",
          entityId: amendment.id,
          before: {
            runId: signed.id,
            status: signed.status,
            round: signed.reviewRound,
            versionNumber: signed.versionNumber,
          },
          after: {
            status: "draft",
            round: 0,
            versionNumber: amendment.versionNumber,
            amendsRunId: signed.id,
            carriedOverrides: carried.map((o) => ({ species: o.species, verdict: o.verdict })),
          },
        },
        transaction,
      );
      return { id: amendment.id, versionNumber: amendment.versionNumber, amendsRunId: signed.id };
    });
  } catch (error) {
    // Two amendments at once: the unique index lets one through.
    if (error instanceof UniqueConstraintError)
      throw new AppError("conflict", "This run already has an amendment.");
    throw error;
  }
}

// ---------------------------------------------------------------------------------------------
// Reading: history, the panel's state, the queue

async function versionsOf(
  run: Run,
): Promise<{ versions: RunVersionRef[]; amendedById: string | null }> {
  const attributes = ["id", "versionNumber", "status", "signedAt", "amendsRunId"];
  const chain: Run[] = [run];
  for (let previousId = run.amendsRunId; previousId;) {
    const previous = await Run.findByPk(previousId, { attributes });
    if (!previous) break;
    chain.unshift(previous);
    previousId = previous.amendsRunId;
  }
  let amendedById: string | null = null;
  for (let current = run.id; ;) {
    const next = await Run.findOne({ where: { amendsRunId: current }, attributes });
    if (!next) break;
    if (current === run.id) amendedById = next.id;
    chain.push(next);
    current = next.id;
  }
  return {
    versions: chain.map((r) => ({
      id: r.id,
      versionNumber: r.versionNumber,
      status: r.status,
      signedAt: r.signedAt?.toISOString() ?? null,
    })),
    amendedById,
  };
}

async function historyOf(run: Run): Promise<RunHistory> {
  const [rounds, marks, signature, chain] = await Promise.all([
    RunRound.findAll({
      where: { runId: run.id },
      include: [
        { model: User, as: "submittedBy", attributes: ["id", "name"] },
        { model: User, as: "decidedBy", attributes: ["id", "name"] },
      ],
      order: [["round", "ASC"]],
    }),
    RunReviewMark.findAll({
      where: { runId: run.id },
      include: [{ model: User, as: "reviewer", attributes: ["id", "name"] }],
      order: [
        ["createdAt", "ASC"],
        ["id", "ASC"],
      ],
    }),
    RunSignature.findOne({
      where: { runId: run.id },
      include: [{ model: User, as: "signer", attributes: ["id", "name"] }],
    }),
    versionsOf(run),
  ]);
  const requestedIds = [
    ...new Set(rounds.map((r) => r.requestedReviewerId).filter((id): id is string => Boolean(id))),
  ];
  const requested = new Map(
    (requestedIds.length
      ? await User.findAll({ where: { id: requestedIds }, attributes: ["id", "name"] })
      : []
    ).map((u) => [u.id, u]),
  );
  const markRecords: ReviewMarkRecord[] = marks.map((m) => ({
    id: m.id,
    round: m.round,
    reviewer: person(m.get("reviewer") as User | null),
    species: m.species,
    lineNm: m.lineNm,
    agreement: m.agreement,
    comment: m.comment,
    at: m.createdAt.toISOString(),
  }));
  return {
    runId: run.id,
    status: run.status,
    statusLabel: STATUS_LABEL[run.status as RunStatus],
    reviewRound: run.reviewRound,
    versionNumber: run.versionNumber,
    rounds: rounds.map((r) => ({
      round: r.round,
      submittedBy: person(r.get("submittedBy") as User | null),
      submittedAt: r.submittedAt.toISOString(),
      requestedReviewer: person(
        r.requestedReviewerId ? requested.get(r.requestedReviewerId) : null,
      ),
      decision: r.decision ?? null,
      decidedBy: person(r.get("decidedBy") as User | null),
      decidedAt: r.decidedAt?.toISOString() ?? null,
      comment: r.comment,
      reply: r.reply,
      marks: markRecords.filter((m) => m.round === r.round),
    })),
    signature: signature
      ? {
          round: signature.round,
          signer: person(signature.get("signer") as User)!,
          signerName: signature.signerName,
          meaning: signature.meaning,
          contentHash: signature.contentHash,
          signedAt: signature.signedAt.toISOString(),
        }
      : null,
    versions: chain.versions,
    amendsRunId: run.amendsRunId,
    amendedById: chain.amendedById,
  };
}

export async function fetchRunHistory(actor: Actor, runId: string): Promise<RunHistory> {
  return historyOf(await loadRun(actor, runId));
}

/** Everything the run page's review panel and the review page need to show and offer. */
export async function fetchRunReviewState(actor: Actor, runId: string): Promise<RunReviewState> {
  const run = await loadRun(actor, runId);
  const [history, supervisors] = await Promise.all([historyOf(run), supervisorsOf(run.teamId)]);
  const isAuthor = run.createdById === actor.id;
  const isReviewer = can(actor, "run.review", { teamId: run.teamId });
  const refusal = isReviewer ? decideRefusal(actor, run) : null;
  return {
    runId: run.id,
    teamId: run.teamId,
    status: run.status,
    statusLabel: STATUS_LABEL[run.status as RunStatus],
    lockReason: lockReason(run),
    isAuthor,
    maySubmit:
      isAuthor && lockReason(run) === null && can(actor, "run.edit", { teamId: run.teamId }),
    isReviewer,
    mayDecide: isReviewer && refusal === null,
    whyNotDecide: refusal?.message ?? null,
    mayAmend:
      run.status === "signed" &&
      history.amendedById === null &&
      (isAuthor || isReviewer) &&
      can(actor, "run.edit", { teamId: run.teamId }),
    reviewers: supervisors
      .filter((s) => s.id !== run.createdById)
      .map((s) => ({ id: s.id, name: s.name })),
    history,
  };
}

interface QueueRow {
  id: string;
  submitted_at: Date;
  review_round: number;
  version_number: number;
  requested_reviewer_id: string | null;
  calls: RunCall[];
  created_by_id: string | null;
  author_name: string | null;
  label: string;
  file_name: string;
  instrument_id: string;
  instrument_name: string;
  notebook_title: string;
}

const WAITING_FOR = `r.team_id = $1 AND r.status = 'submitted'
  AND (r.requested_reviewer_id IS NULL OR r.requested_reviewer_id = $2)
  AND r.created_by_id IS DISTINCT FROM $2`;

/** Runs of the team waiting for the actor (named to them or to no one; never their own), oldest first. */
export async function fetchReviewQueue(
  actor: Actor,
  query: ReviewQueueQuery,
): Promise<ReviewQueue> {
  authorize(actor, "run.review", { teamId: query.teamId });
  const rows = await sequelize.query<QueueRow>(
    `SELECT r.id, r.submitted_at, r.review_round, r.version_number, r.requested_reviewer_id, r.calls, r.created_by_id,
            u.name AS author_name, s.label, s.file_name, i.id AS instrument_id, i.name AS instrument_name, n.title AS notebook_title
       FROM runs r
       JOIN spectrum_files s ON s.id = r.spectrum_id
       JOIN instruments i ON i.id = s.instrument_id
       JOIN notebooks n ON n.id = r.notebook_id
       LEFT JOIN users u ON u.id = r.created_by_id
      WHERE ${WAITING_FOR}
      ORDER BY r.submitted_at ASC, r.id ASC`,
    { bind: [query.teamId, actor.id], type: QueryTypes.SELECT },
  );
  const overrides = await overridesByRun(rows.map((r) => r.id));
  const now = Date.now();
  const all: ReviewQueueItem[] = rows.map((row) => {
    const own = overrides.get(row.id) ?? [];
    const verdicts: Record<string, Verdict> = standingVerdicts(row.calls, own);
    const submittedAt = new Date(row.submitted_at);
    return {
      runId: row.id,
      label: row.label || row.file_name,
      notebookTitle: row.notebook_title,
      author: row.created_by_id ? { id: row.created_by_id, name: row.author_name ?? "" } : null,
      instrument: { id: row.instrument_id, name: row.instrument_name },
      round: row.review_round,
      versionNumber: row.version_number,
      namedToMe: row.requested_reviewer_id === actor.id,
      submittedAt: submittedAt.toISOString(),
      waitingSeconds: Math.max(0, Math.round((now - submittedAt.getTime()) / 1000)),
      present: Object.entries(verdicts)
        .filter(([, verdict]) => verdict === "present")
        .map(([species]) => species)
        .sort(),
    };
  });
  const unique = <T extends { id: string; name: string }>(list: T[]) =>
    [...new Map(list.map((x) => [x.id, x])).values()].sort((a, b) => a.name.localeCompare(b.name));
  return {
    items: all.filter(
      (item) =>
        (!query.author || item.author?.id === query.author) &&
        (!query.instrumentId || item.instrument.id === query.instrumentId) &&
        (!query.species || item.present.includes(query.species)),
    ),
    total: all.length,
    options: {
      authors: unique(all.flatMap((i) => (i.author ? [i.author] : []))),
      instruments: unique(all.map((i) => i.instrument)),
      species: [...new Set(all.flatMap((i) => i.present))].sort(),
    },
  };
}

/** How many runs wait for the actor in the team: the navigation's count (0 for non-supervisors). */
export async function countRunsWaitingFor(actor: Actor, teamId: string): Promise<number> {
  if (!can(actor, "run.review", { teamId })) return 0;
  const [row] = await sequelize.query<{ count: string }>(
    `SELECT count(*) AS count FROM runs r WHERE ${WAITING_FOR}`,
    {
      bind: [teamId, actor.id],
      type: QueryTypes.SELECT,
    },
  );
  return Number(row?.count ?? 0);
}
