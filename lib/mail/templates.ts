// The words of every e-mail Emberline sends, in one place.
import { env } from "../env";
import { ROLE_LABELS, type TeamRole } from "../auth/roles";
import { countOf } from "@/lib/text/count-of";

const signature = "\n\n— Emberline, the emission-spectra notebook of your lab";

export function invitationMail(input: {
  teamName: string;
  role: TeamRole;
  inviterName: string;
  token: string;
  /** Sent again with a fresh link: the link of the earlier message no longer works. */
  resent?: boolean;
}) {
  const link = `${env().appUrl}/invitations/${input.token}`;
  return {
    subject: `You are invited to ${input.teamName} on Emberline`,
    text:
      `${input.inviterName} invites you to join ${input.teamName} as ${ROLE_LABELS[input.role].toLowerCase()}.\n\n` +
      `Open this link to set your password and join (valid for 7 days):\n${link}` +
      (input.resent
        ? "\n\nThis message replaces an earlier invitation: the link in the earlier message no longer works."
        : "") +
      signature,
  };
}

export function invitationRevokedMail(input: { teamName: string; revokerName: string }) {
  return {
    subject: `Your invitation to ${input.teamName} was revoked`,
    text:
      `${input.revokerName} revoked the invitation to join ${input.teamName} on Emberline; ` +
      `its link no longer works.\n\nIf you think you should still join, ask a lab lead of the team for a new invitation.` +
      signature,
  };
}

export function memberRoleChangedMail(input: {
  name: string;
  teamName: string;
  from: TeamRole;
  to: TeamRole;
  changedByName: string;
}) {
  return {
    subject: `Your role in ${input.teamName} is now ${ROLE_LABELS[input.to].toLowerCase()}`,
    text:
      `Hello ${input.name},\n\n${input.changedByName} changed your role in ${input.teamName} from ` +
      `${ROLE_LABELS[input.from].toLowerCase()} to ${ROLE_LABELS[input.to].toLowerCase()}. ` +
      `It applies from your next request, on every signed-in browser and access token.` +
      signature,
  };
}

export function memberRemovedMail(input: {
  name: string;
  teamName: string;
  removedByName: string;
}) {
  return {
    subject: `You were removed from ${input.teamName} on Emberline`,
    text:
      `Hello ${input.name},\n\n${input.removedByName} removed you from ${input.teamName}. ` +
      `Your signed-in sessions and access tokens no longer open its notebooks, instruments, line table ` +
      `or audit trail; your other teams are not affected. What you recorded in the team stays in its records.\n\n` +
      `If you think this is a mistake, ask a lab lead of ${input.teamName}.` +
      signature,
  };
}

export function passwordResetMail(input: { name: string; token: string }) {
  const link = `${env().appUrl}/reset-password/${input.token}`;
  return {
    subject: "Reset your Emberline password",
    text:
      `Hello ${input.name},\n\nSomeone (hopefully you) asked to reset your Emberline password. ` +
      `Open this link within one hour to choose a new one:\n${link}\n\n` +
      `If you did not ask for this, ignore this message; your password stays as it is.` +
      signature,
  };
}

export function releasePublishedMail(input: {
  teamName: string;
  number: number;
  lineCount: number;
  notes: string;
  publisherName: string;
  releaseId: string;
}) {
  const link = `${env().appUrl}/lines?release=${input.releaseId}`;
  return {
    subject: `Line table release ${input.number} of ${input.teamName} is published`,
    text:
      `${input.publisherName} published release ${input.number} of the ${input.teamName} line table ` +
      `(${countOf(input.lineCount, "line")}).\n\nNotes:\n${input.notes}\n\n` +
      `New identifications use this release; earlier results stay tied to the release they used.\n${link}` +
      signature,
  };
}

export function runSubmittedMail(input: {
  teamName: string;
  authorName: string;
  runLabel: string;
  round: number;
  named: boolean;
  runId: string;
}) {
  const link = `${env().appUrl}/review/${input.runId}`;
  const whom = input.named ? "asks you to review" : "submitted for review";
  return {
    subject: `Run submitted for review: ${input.runLabel}`,
    text:
      `${input.authorName} ${whom} the run "${input.runLabel}" in ${input.teamName}` +
      `${input.round > 1 ? ` (round ${input.round}, after revision)` : ""}.\n\n` +
      `Open it to agree or disagree with the calls, return it with comments, or sign it off:\n${link}` +
      signature,
  };
}

export function runReturnedMail(input: {
  authorName: string;
  reviewerName: string;
  runLabel: string;
  round: number;
  comment: string;
  runId: string;
}) {
  const link = `${env().appUrl}/runs/${input.runId}`;
  return {
    subject: `Run returned: ${input.runLabel}`,
    text:
      `Hello ${input.authorName},\n\n${input.reviewerName} returned the run "${input.runLabel}" ` +
      `(review round ${input.round}) with this comment:\n\n${input.comment}\n\n` +
      `Revise it and submit it again when it is ready:\n${link}` +
      signature,
  };
}
