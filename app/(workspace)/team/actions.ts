"use server";
// Server actions of the team page: a lab lead changes a member's role, removes a member, and resends
// or revokes an invitation. Each answers one sentence for the page's live region.
import { revalidatePath } from "next/cache";
import { requireActor } from "@/lib/auth/session";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { changeMemberRole, removeMember } from "@/lib/services/team-members";
import { resendInvitation, revokeInvitation } from "@/lib/services/teams";
import {
  invitationFormSchema,
  memberFormSchema,
  memberRoleFormSchema,
} from "@/lib/validation/account-schemas";
import { formError, parseForm, type FormState } from "@/lib/validation/form-state";

export async function changeMemberRoleAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const { data, state } = parseForm(memberRoleFormSchema, formData);
  if (state) return state;
  try {
    const member = await changeMemberRole(await requireActor(), data);
    revalidatePath("/team");
    return {
      ok: true,
      message: `${member.name} is now ${ROLE_LABELS[member.role].toLowerCase()}; it applies from their next request, and they were told by e-mail.`,
    };
  } catch (error) {
    return formError(error);
  }
}

export async function removeMemberAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const { data, state } = parseForm(memberFormSchema, formData);
  if (state) return state;
  try {
    const removed = await removeMember(await requireActor(), data);
    revalidatePath("/team");
    return {
      ok: true,
      message: `${removed.name} was removed from the team: their sessions and access tokens no longer open its records, and they were told by e-mail.`,
    };
  } catch (error) {
    return formError(error);
  }
}

export async function resendInvitationAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const { data, state } = parseForm(invitationFormSchema, formData);
  if (state) return state;
  try {
    const invitation = await resendInvitation(await requireActor(), data.invitationId);
    revalidatePath("/team");
    return {
      ok: true,
      message: `A new link is on its way to ${invitation.email}, valid until ${invitation.expiresAt.slice(0, 10)}; the earlier link no longer works.`,
    };
  } catch (error) {
    return formError(error);
  }
}

export async function revokeInvitationAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const { data, state } = parseForm(invitationFormSchema, formData);
  if (state) return state;
  try {
    const { email } = await revokeInvitation(await requireActor(), data.invitationId);
    revalidatePath("/team");
    return {
      ok: true,
      message: `The invitation to ${email} was revoked: its link now refuses, and ${email} was told by e-mail.`,
    };
  } catch (error) {
    return formError(error);
  }
}
