// Review and sign-off of runs: the author submits (optionally naming a supervisor), supervisors mark
// calls and lines, then return the run with a comment or sign it with their password, which records
// the meaning, signer, time and the SHA-256 of the run's content and locks the run for good. A signed
// run is amended by a new version that goes through review again (run-amendments.ts). Every change
// locks the run's row (so two reviewers cannot both decide) and writes its audit event in the same
// transaction; mail goes out after the commit and a mail failure never undoes a decision. Reading the
// review is run-review-history.ts, the queue of waiting runs review-queue.ts.
import "server-only";
import type { Transaction } from "sequelize";
import { AppError } from "@/lib/errors";
import type { Actor } from "@/lib/auth/actor";
import { sendMail } from "@/lib/mail/send-mail";
import { runReturnedMail, runSubmittedMail } from "@/lib/mail/templates";
import type {
  ReviewDecisionInput,
  ReviewMarkInput,
  SubmitRunInput,
} from "@/lib/validation/review-schemas";
import {
  Run,
  RunReviewMark,
  RunRound,
  RunSignature,
  SpectrumFile,
  User,
  sequelize,
} from "@/models";
import { checkOwnPassword } from "./accounts";
import { recordAudit } from "./audit";
import { runContentHash } from "./run-content";
import { assertAuthorMayEdit, loadRun } from "./run-lifecycle";
import { fetchRunHistory } from "./run-review-history";
import { assertMayDecide, supervisorsOf } from "./run-review-shared";
import type { ReviewMarkRecord, RunHistory } from "./run-review-types";
import { runContentOf } from "./run-signed-content";

/** What a signature says, recorded with it and shown beside it. */
export const SIGNATURE_MEANING = "Reviewed and approved";

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
    const call = run.calls.find((c) => c.species === input.species);
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
  const { valid } = await checkOwnPassword(actor, password, address);
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
