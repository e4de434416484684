// Reading a run's review: its rounds, marks, signature and versions, and what the signed-in person
// may do about it now (the run page's review panel and the review page).
import "server-only";
import type { Actor } from "@/lib/auth/actor";
import { can } from "@/lib/auth/policy";
import { Run, RunReviewMark, RunRound, RunSignature, User } from "@/models";
import type { RunStatus } from "@/lib/runs/types";
import { STATUS_LABEL, loadRun, lockReason } from "./run-lifecycle";
import { decideRefusal, person, supervisorsOf } from "./run-review-shared";
import type {
  ReviewMarkRecord,
  RunHistory,
  RunReviewState,
  RunVersionRef,
} from "./run-review-types";

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
