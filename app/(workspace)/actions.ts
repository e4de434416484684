"use server";
// Server actions of the signed-in shell and the account and team pages.
import { revalidatePath } from "next/cache";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { z } from "zod";
import { currentSessionId, endSession, getSession, requireActor } from "@/lib/auth/session";
import { clientAddress } from "@/lib/http/client-address";
import { changePassword, describeRevoked } from "@/lib/services/accounts";
import { createAccessToken, revokeAccessToken } from "@/lib/services/access-tokens";
import { recordAudit } from "@/lib/services/audit";
import { inviteMember } from "@/lib/services/teams";
import {
  invitationSchema,
  passwordChangeSchema,
  tokenCreateSchema,
} from "@/lib/validation/account-schemas";
import { formError, parseForm, type FormState } from "@/lib/validation/form-state";

export async function signOutAction(): Promise<void> {
  const userId = await endSession();
  if (userId)
    await recordAudit({
      actorId: userId,
      action: "session.delete",
      entity: "user",
      entityId: userId,
    });
  redirect("/sign-in");
}

export async function switchTeamAction(formData: FormData): Promise<void> {
  const actor = await requireActor();
  const teamId = String(formData.get("teamId") ?? "");
  if (actor.memberships.some((m) => m.teamId === teamId)) {
    const session = await getSession();
    session.teamId = teamId;
    await session.save();
  }
  revalidatePath("/", "layout");
}

export async function changePasswordAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const { data, state } = parseForm(passwordChangeSchema, formData);
  if (state) return state;
  try {
    const revoked = await changePassword(await requireActor(), data, {
      keepSessionId: await currentSessionId(),
      address: clientAddress(await headers()),
    });
    revalidatePath("/account");
    return { ok: true, message: `Your password is changed. ${describeRevoked(revoked, "change")}` };
  } catch (error) {
    return formError(error);
  }
}

export async function createTokenAction(
  _state: FormState & { token?: string },
  formData: FormData,
): Promise<FormState & { token?: string }> {
  const { data, state } = parseForm(tokenCreateSchema, formData);
  if (state) return state;
  try {
    const created = await createAccessToken(await requireActor(), data);
    revalidatePath("/account");
    return {
      ok: true,
      message: "Copy the token now: it is shown only once.",
      token: created.token,
    };
  } catch (error) {
    return formError(error);
  }
}

export async function revokeTokenAction(formData: FormData): Promise<void> {
  const id = z.uuid().parse(formData.get("tokenId"));
  await revokeAccessToken(await requireActor(), id);
  revalidatePath("/account");
}

export async function inviteAction(_state: FormState, formData: FormData): Promise<FormState> {
  const { data, state } = parseForm(invitationSchema, formData);
  if (state) return state;
  try {
    await inviteMember(await requireActor(), data);
  } catch (error) {
    return formError(error);
  }
  revalidatePath("/team");
  return {
    ok: true,
    message: `An invitation is on its way to ${data.email}.`,
    values: { email: data.email },
  };
}
