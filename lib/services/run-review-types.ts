// The shapes of a run's review as pages and the API see them: rounds, marks, the signature, the
// versions, what the signed-in person may do now, and the queue of runs waiting for a supervisor.
import type { RunStatus } from "@/lib/runs/types";

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
