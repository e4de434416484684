// Form and API schemas for sign-in, tokens, invitations and passwords; variants derive from one base.
import { z } from "zod";
import { text } from "./text";
import { TEAM_ROLES } from "@/lib/auth/roles";
import { PASSWORD_MAX_LENGTH } from "@/lib/auth/password";

const email = text({ error: "Enter an e-mail address." })
  .trim()
  .toLowerCase()
  .email("Enter a valid e-mail address.");
const password = z
  .string({ error: "Enter a password." })
  .min(1, "Enter a password.")
  .max(PASSWORD_MAX_LENGTH);

export const signInSchema = z.object({ email, password });

export const tokenCreateSchema = z.object({
  name: text({ error: "Name the token." })
    .trim()
    .min(1, "Name the token.")
    .max(80, "Use at most 80 characters."),
});

export const invitationSchema = z.object({
  teamId: z.uuid("Choose a team."),
  email,
  role: z.enum(TEAM_ROLES, { error: "Choose a role." }),
});

/** PATCH /api/teams/:id/members/:userId: the member's new role. */
export const memberRoleSchema = z.object({
  role: z.enum(TEAM_ROLES, { error: "Choose a role: chemist, supervisor or lab lead." }),
});

/** The team page's forms name the team and the member (or invitation) in hidden fields. */
export const memberFormSchema = z.object({
  teamId: z.uuid("Choose a team."),
  userId: z.uuid("Choose a member."),
});
export const memberRoleFormSchema = memberFormSchema.extend(memberRoleSchema.shape);
export const invitationFormSchema = z.object({ invitationId: z.uuid("Choose an invitation.") });

export const acceptInvitationSchema = z.object({
  token: text().min(10),
  name: text().trim().max(120).optional(),
  password,
});

export const passwordResetRequestSchema = z.object({ email });
export const passwordResetSchema = z.object({ token: text().min(10), password });
export const passwordChangeSchema = z.object({ currentPassword: password, newPassword: password });
