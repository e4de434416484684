"use client";
// One client form for every signed-out page: fields, a submit button and the action's messages.
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

export interface AuthField {
  name: string;
  label: string;
  type?: string;
  autoComplete?: string;
  hint?: string;
  defaultValue?: string;
  readOnly?: boolean;
}

export function AuthForm({
  action,
  fields,
  hidden = {},
  submitLabel,
}: {
  action: (state: FormState, formData: FormData) => Promise<FormState>;
  fields: AuthField[];
  hidden?: Record<string, string>;
  submitLabel: string;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  return (
    <form action={formAction} className="flex flex-col gap-3" noValidate>
      {Object.entries(hidden).map(([name, value]) => (
        <input key={name} type="hidden" name={name} value={value} />
      ))}
      {fields.map((field) => (
        <Field
          name={field.name}
          label={field.label}
          type={field.type ?? "text"}
          autoComplete={field.autoComplete}
          hint={field.hint}
          defaultValue={state.values?.[field.name] ?? field.defaultValue}
          // React 19 resets a form after its action; remounting with the kept value refills it.
          key={`${field.name}-${state.values?.[field.name] ?? ""}`}
          readOnly={field.readOnly}
          errors={state.fieldErrors?.[field.name]}
          required
        />
      ))}
      <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
      <Button type="submit" pending={pending}>
        {pending ? "Working…" : submitLabel}
      </Button>
    </form>
  );
}
