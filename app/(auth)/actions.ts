"use server";
// Server actions of the signed-out pages: sign in, ask for a reset link, reset, accept an invitation.
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { text } from "@/lib/validation/text";
import { startSession } from "@/lib/auth/session";
import { clientAddress } from "@/lib/http/client-address";
import { safeNextPath } from "@/lib/http/safe-next-path";
import { loadActor, requestPasswordReset, resetPassword, signIn } from "@/lib/services/accounts";
import { acceptInvitation } from "@/lib/services/teams";
import {
  acceptInvitationSchema,
  passwordResetRequestSchema,
  passwordResetSchema,
  signInSchema,
} from "@/lib/validation/account-schemas";
import { formError, parseForm, type FormState } from "@/lib/validation/form-state";

async function address(): Promise<string> {
  return clientAddress(await headers());
}

export async function signInAction(_state: FormState, formData: FormData): Promise<FormState> {
  const { data, state } = parseForm(signInSchema, formData);
  if (state) return state;
  try {
    await startSession(await signIn({ ...data, address: await address() }));
  } catch (error) {
    return { ...formError(error), values: { email: data.email } };
  }
  redirect(safeNextPath(formData.get("next")));
}

export async function requestResetAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const { data, state } = parseForm(passwordResetRequestSchema, formData);
  if (state) return state;
  try {
    await requestPasswordReset({ ...data, address: await address() });
  } catch (error) {
    return formError(error);
  }
  return {
    ok: true,
    message: "If that address has an account, a reset link is on its way. It works for one hour.",
  };
}

export async function resetPasswordAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const { data, state } = parseForm(passwordResetSchema, formData);
  if (state) return state;
  try {
    await resetPassword({ ...data, address: await address() });
  } catch (error) {
    return formError(error);
  }
  redirect("/sign-in?reset=1");
}

export async function acceptInvitationAction(
  _state: FormState,
  formData: FormData,
): Promise<FormState> {
  const { data, state } = parseForm(
    acceptInvitationSchema.extend({ name: text().trim().max(120).optional() }),
    formData,
  );
  if (state) return state;
  try {
    await startSession(
      (await loadActor(await acceptInvitation({ ...data, address: await address() })))!,
    );
  } catch (error) {
    return formError(error);
  }
  redirect("/");
}
