"use client";
// Creates a personal access token and shows its secret once.
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import type { FormState } from "@/lib/validation/form-state";

type TokenState = FormState & { token?: string };

export function TokenForm({
  action,
}: {
  action: (state: TokenState, formData: FormData) => Promise<TokenState>;
}) {
  const [state, formAction, pending] = useActionState(action, {});
  return (
    <form action={formAction} className="flex flex-col gap-3" noValidate>
      <Field
        name="name"
        label="Token name"
        hint="For example: the instrument PC in room 2."
        errors={state.fieldErrors?.name}
      />
      <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
      {state.token ? (
        <output className="block rounded border border-ember-300 bg-ember-50 p-2 font-mono text-xs break-all text-ink-900">
          {state.token}
        </output>
      ) : null}
      <Button type="submit" pending={pending}>
        Create token
      </Button>
    </form>
  );
}
