// The append-only records around a run's review: overridden calls, review rounds, reviewers' marks
// on calls and lines, and signatures. The database refuses edits to all but an undecided round.
import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
} from "sequelize";
import { sequelize } from "../db/sequelize";
import type { Verdict } from "../lib/spectrum/matching";
import type { User } from "./user";

/** A chemist's change of one call's verdict, with the reason; verdict null withdraws an earlier override. */
export class RunOverride extends Model<
  InferAttributes<RunOverride>,
  InferCreationAttributes<RunOverride>
> {
  declare id: CreationOptional<string>;
  declare runId: string;
  declare species: string;
  declare computedVerdict: Verdict;
  declare verdict: Verdict | null;
  declare reason: string;
  declare createdById: string | null;
  declare createdAt: CreationOptional<Date>;
  /** Its author, when loaded with the override (`include` as "createdBy"). */
  declare createdBy?: NonAttribute<User>;
}

RunOverride.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    runId: { type: DataTypes.UUID, allowNull: false },
    species: { type: DataTypes.TEXT, allowNull: false },
    computedVerdict: { type: DataTypes.TEXT, allowNull: false },
    verdict: { type: DataTypes.TEXT, allowNull: true },
    reason: { type: DataTypes.TEXT, allowNull: false },
    createdById: { type: DataTypes.UUID, allowNull: true },
    createdAt: DataTypes.DATE,
  },
  { sequelize, tableName: "run_overrides", updatedAt: false },
);

/** One round of review: the submission and, once decided, whether the run was returned or signed. */
export class RunRound extends Model<InferAttributes<RunRound>, InferCreationAttributes<RunRound>> {
  declare id: CreationOptional<string>;
  declare runId: string;
  declare round: number;
  declare submittedById: string | null;
  declare submittedAt: CreationOptional<Date>;
  declare requestedReviewerId: string | null;
  declare decision: CreationOptional<"returned" | "signed" | null>;
  declare decidedById: CreationOptional<string | null>;
  declare decidedAt: CreationOptional<Date | null>;
  declare comment: CreationOptional<string>;
  /** The author's reply to the previous round's comments, given when submitting this round. */
  declare reply: CreationOptional<string>;
  /** The run's content SHA-256 when this round was returned: a resubmission unchanged needs a reply. */
  declare decidedContentHash: CreationOptional<string | null>;
}

RunRound.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    runId: { type: DataTypes.UUID, allowNull: false },
    round: { type: DataTypes.INTEGER, allowNull: false },
    submittedById: { type: DataTypes.UUID, allowNull: true },
    submittedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    requestedReviewerId: { type: DataTypes.UUID, allowNull: true },
    decision: { type: DataTypes.TEXT, allowNull: true },
    decidedById: { type: DataTypes.UUID, allowNull: true },
    decidedAt: { type: DataTypes.DATE, allowNull: true },
    comment: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    reply: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    decidedContentHash: { type: DataTypes.TEXT, allowNull: true },
  },
  { sequelize, tableName: "run_rounds", timestamps: false },
);

/** A reviewer's agreement or disagreement with a call, or a comment on a call or one of its lines. */
export class RunReviewMark extends Model<
  InferAttributes<RunReviewMark>,
  InferCreationAttributes<RunReviewMark>
> {
  declare id: CreationOptional<string>;
  declare runId: string;
  declare round: number;
  declare reviewerId: string | null;
  declare species: string;
  declare lineNm: number | null;
  declare agreement: "agree" | "disagree" | null;
  declare comment: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
}

RunReviewMark.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    runId: { type: DataTypes.UUID, allowNull: false },
    round: { type: DataTypes.INTEGER, allowNull: false },
    reviewerId: { type: DataTypes.UUID, allowNull: true },
    species: { type: DataTypes.TEXT, allowNull: false },
    lineNm: { type: DataTypes.DOUBLE, allowNull: true },
    agreement: { type: DataTypes.TEXT, allowNull: true },
    comment: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    createdAt: DataTypes.DATE,
  },
  { sequelize, tableName: "run_review_marks", updatedAt: false },
);

/** An electronic signature: signer, time, meaning and the SHA-256 of the run record signed. */
export class RunSignature extends Model<
  InferAttributes<RunSignature>,
  InferCreationAttributes<RunSignature>
> {
  declare id: CreationOptional<string>;
  declare runId: string;
  declare round: number;
  declare signerId: string;
  declare signerName: string;
  declare meaning: string;
  declare contentHash: string;
  declare signedAt: CreationOptional<Date>;
}

RunSignature.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    runId: { type: DataTypes.UUID, allowNull: false },
    round: { type: DataTypes.INTEGER, allowNull: false },
    signerId: { type: DataTypes.UUID, allowNull: false },
    signerName: { type: DataTypes.TEXT, allowNull: false },
    meaning: { type: DataTypes.TEXT, allowNull: false },
    contentHash: { type: DataTypes.TEXT, allowNull: false },
    signedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  },
  { sequelize, tableName: "run_signatures", timestamps: false },
);
