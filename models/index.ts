// All models and their associations; import models from here so associations are always set.
import { AccessToken } from "./access-token";
import { AuditEvent } from "./audit-event";
import { Invitation } from "./invitation";
import { Line } from "./line";
import { LineRelease } from "./line-release";
import { Membership } from "./membership";
import { PasswordResetToken } from "./password-reset-token";
import { SignInAttempt } from "./sign-in-attempt";
import { Team } from "./team";
import { User } from "./user";
import { UserSession } from "./user-session";

User.hasMany(Membership, { foreignKey: "userId", as: "memberships" });
Membership.belongsTo(User, { foreignKey: "userId", as: "user" });
Team.hasMany(Membership, { foreignKey: "teamId", as: "memberships" });
Membership.belongsTo(Team, { foreignKey: "teamId", as: "team" });
Invitation.belongsTo(Team, { foreignKey: "teamId", as: "team" });
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

export {
  AccessToken,
  AuditEvent,
  Invitation,
  Line,
  LineRelease,
  Membership,
  PasswordResetToken,
  SignInAttempt,
  Team,
  User,
  UserSession,
};
export { sequelize } from "../db/sequelize";
