// The words of every e-mail Emberline sends, in one place.
import { env } from "../env";
import { ROLE_LABELS, type TeamRole } from "../auth/roles";

const signature = "\n\n— Emberline, the emission-spectra notebook of your lab";

export function invitationMail(input: {
  teamName: string;
  role: TeamRole;
  inviterName: string;
  token: string;
}) {
  const link = `${env().appUrl}/invitations/${input.token}`;
  return {
    subject: `You are invited to ${input.teamName} on Emberline`,
    text:
      `${input.inviterName} invites you to join ${input.teamName} as ${ROLE_LABELS[input.role].toLowerCase()}.\n\n` +
      `Open this link to set your password and join (valid for 7 days):\n${link}` +
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
      `(${input.lineCount} lines).\n\nNotes:\n${input.notes}\n\n` +
      `New identifications use this release; earlier results stay tied to the release they used.\n${link}` +
      signature,
  };
}
