// All models and their associations; import models from here so associations are always set.
import { AccessToken } from "./access-token";
import { AuditEvent } from "./audit-event";
import { Calibration } from "./calibration";
import { Instrument } from "./instrument";
import { Invitation } from "./invitation";
import { Line } from "./line";
import { LineRelease } from "./line-release";
import { Membership } from "./membership";
import { MembershipRemoval } from "./membership-removal";
import { Notebook } from "./notebook";
import { PasswordResetToken } from "./password-reset-token";
import { Run } from "./run";
import { RunOverride, RunReviewMark, RunRound, RunSignature } from "./run-review";
import { SignInAttempt } from "./sign-in-attempt";
import { SpectrumFile } from "./spectrum-file";
import { Team } from "./team";
import { User } from "./user";
import { UserSession } from "./user-session";

User.hasMany(Membership, { foreignKey: "userId", as: "memberships" });
Membership.belongsTo(User, { foreignKey: "userId", as: "user" });
Team.hasMany(Membership, { foreignKey: "teamId", as: "memberships" });
Membership.belongsTo(Team, { foreignKey: "teamId", as: "team" });
Invitation.belongsTo(Team, { foreignKey: "teamId", as: "team" });
MembershipRemoval.belongsTo(Team, { foreignKey: "teamId", as: "team" });
Invitation.belongsTo(User, { foreignKey: "invitedById", as: "invitedBy" });
AccessToken.belongsTo(User, { foreignKey: "userId", as: "user" });
PasswordResetToken.belongsTo(User, { foreignKey: "userId", as: "user" });
AuditEvent.belongsTo(User, { foreignKey: "actorId", as: "actor" });
UserSession.belongsTo(User, { foreignKey: "userId", as: "user" });
Team.hasMany(LineRelease, { foreignKey: "teamId", as: "lineReleases" });
LineRelease.belongsTo(Team, { foreignKey: "teamId", as: "team" });
LineRelease.belongsTo(User, { foreignKey: "createdById", as: "createdBy" });
LineRelease.belongsTo(User, { foreignKey: "publishedById", as: "publishedBy" });
LineRelease.hasMany(Line, { foreignKey: "releaseId", as: "lines" });
Line.belongsTo(LineRelease, { foreignKey: "releaseId", as: "release" });
Line.belongsTo(User, { foreignKey: "verifiedById", as: "verifiedBy" });
Team.hasMany(Instrument, { foreignKey: "teamId", as: "instruments" });
Instrument.belongsTo(Team, { foreignKey: "teamId", as: "team" });
Instrument.hasMany(SpectrumFile, { foreignKey: "instrumentId", as: "spectra" });
SpectrumFile.belongsTo(Instrument, { foreignKey: "instrumentId", as: "instrument" });
SpectrumFile.belongsTo(User, { foreignKey: "uploadedById", as: "uploadedBy" });
Instrument.hasMany(Calibration, { foreignKey: "instrumentId", as: "calibrations" });
Calibration.belongsTo(Instrument, { foreignKey: "instrumentId", as: "instrument" });
Calibration.belongsTo(SpectrumFile, { foreignKey: "spectrumId", as: "spectrum" });
Calibration.belongsTo(LineRelease, { foreignKey: "lineReleaseId", as: "lineRelease" });
Team.hasMany(Notebook, { foreignKey: "teamId", as: "notebooks" });
Notebook.belongsTo(Team, { foreignKey: "teamId", as: "team" });
Notebook.hasMany(Run, { foreignKey: "notebookId", as: "runs" });
Run.belongsTo(Notebook, { foreignKey: "notebookId", as: "notebook" });
Run.belongsTo(SpectrumFile, { foreignKey: "spectrumId", as: "spectrum" });
Run.belongsTo(Calibration, { foreignKey: "calibrationId", as: "calibration" });
Run.belongsTo(LineRelease, { foreignKey: "lineReleaseId", as: "lineRelease" });
Run.belongsTo(User, { foreignKey: "createdById", as: "createdBy" });
Run.belongsTo(Run, { foreignKey: "amendsRunId", as: "amends" });
Run.hasMany(RunOverride, { foreignKey: "runId", as: "overrides" });
Run.hasMany(RunRound, { foreignKey: "runId", as: "rounds" });
Run.hasMany(RunReviewMark, { foreignKey: "runId", as: "reviewMarks" });
Run.hasOne(RunSignature, { foreignKey: "runId", as: "signature" });
RunOverride.belongsTo(User, { foreignKey: "createdById", as: "createdBy" });
RunRound.belongsTo(User, { foreignKey: "submittedById", as: "submittedBy" });
RunRound.belongsTo(User, { foreignKey: "decidedById", as: "decidedBy" });
RunReviewMark.belongsTo(User, { foreignKey: "reviewerId", as: "reviewer" });
RunSignature.belongsTo(User, { foreignKey: "signerId", as: "signer" });

export {
  AccessToken,
  AuditEvent,
  Calibration,
  Instrument,
  Invitation,
  Line,
  LineRelease,
  Membership,
  MembershipRemoval,
  Notebook,
  PasswordResetToken,
  Run,
  RunOverride,
  RunReviewMark,
  RunRound,
  RunSignature,
  SignInAttempt,
  SpectrumFile,
  Team,
  User,
  UserSession,
};
export { sequelize } from "../db/sequelize";
