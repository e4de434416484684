"use client";
// Changes the signed-in person's password.
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

export function PasswordForm({
  action,
  minLength,
}: {
  action: (s: FormState, f: FormData) => Promise<FormState>;
  minLength: number;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  return (
    <form action={formAction} className="flex flex-col gap-3" noValidate>
      <Field
        name="currentPassword"
        label="Current password"
        type="password"
        autoComplete="current-password"
        errors={state.fieldErrors?.currentPassword}
      />
      <Field
        name="newPassword"
        label="New password"
        type="password"
        autoComplete="new-password"
        hint={`At least ${minLength} characters.`}
        errors={state.fieldErrors?.newPassword}
      />
      <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
      <Button type="submit" pending={pending}>
        Change password
      </Button>
    </form>
  );
}
