"use client";
// The lab lead's form to invite a person by e-mail with a role.
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { ROLE_LABELS, TEAM_ROLES } from "@/lib/auth/roles";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

export function InviteForm({
  teamId,
  pendingEmails,
  action,
}: {
  teamId: string;
  /** The addresses with an open invitation: a success message about one revoked since is dropped. */
  pendingEmails: readonly string[];
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  const invited = state.ok ? state.values?.email?.toLowerCase() : undefined;
  const stale =
    invited !== undefined && !pendingEmails.some((email) => email.toLowerCase() === invited);
  return (
    <form action={formAction} className="flex flex-col gap-3" noValidate>
      <input type="hidden" name="teamId" value={teamId} />
      <Field name="email" label="E-mail" type="email" errors={state.fieldErrors?.email} required />
      <div className="flex flex-col gap-1">
        <label htmlFor="role" className="text-sm font-medium">
          Role
        </label>
        <select
          id="role"
          name="role"
          defaultValue="chemist"
          aria-describedby="role-error"
          className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5"
        >
          {TEAM_ROLES.map((role) => (
            <option key={role} value={role}>
              {ROLE_LABELS[role]}
            </option>
          ))}
        </select>
        <div id="role-error" aria-live="polite" className="text-xs text-red-700">
          {state.fieldErrors?.role?.join(" ")}
        </div>
      </div>
      <FormMessage message={stale ? null : state.message} tone={state.ok ? "ok" : "error"} />
      <Button type="submit" pending={pending}>
        Send invitation
      </Button>
    </form>
  );
}
