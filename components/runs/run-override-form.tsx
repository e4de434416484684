"use client";
// Overrides one call of a run with a reason, or withdraws the standing override. The reason is
// required; the service records who, when and the computed verdict beside it.
import { useActionState, useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

export function RunOverrideForm({
  species,
  computedVerdict,
  overridden,
  action,
}: {
  species: string;
  computedVerdict: "present" | "possible" | "absent";
  /** An override stands now, so it can be withdrawn. */
  overridden: boolean;
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  const [open, setOpen] = useState(false);
  const id = useId();
  const e = state.fieldErrors ?? {};
  const choices = (["present", "possible", "absent"] as const).filter(
    (v) => overridden || v !== computedVerdict,
  );
  const toggle = (
    <button
      type="button"
      aria-expanded={open}
      aria-controls={`${id}-form`}
      onClick={() => setOpen(!open)}
      className="mt-2 rounded text-xs underline focus-visible:outline-2 focus-visible:outline-ember-600"
    >
      {open
        ? "Close the override form"
        : overridden
          ? "Change or withdraw the override"
          : "Override this call"}
    </button>
  );
  if (!open) {
    return (
      <div>
        {toggle}
        {state.ok ? <FormMessage message={state.message} tone="ok" /> : null}
      </div>
    );
  }
  return (
    <div>
      {toggle}
      <form
        id={`${id}-form`}
        action={formAction}
        className="mt-2 flex flex-col gap-2 text-sm"
        noValidate
        aria-label={`Override the call for ${species}`}
        data-testid="override-form"
      >
        <input type="hidden" name="species" value={species} />
        <div className="flex flex-wrap items-end gap-3">
          <div className="flex flex-col gap-1">
            <label htmlFor={`${id}-verdict`} className="text-xs font-medium">
              Verdict
            </label>
            <select
              id={`${id}-verdict`}
              name="verdict"
              defaultValue={state.values?.verdict ?? choices[0]}
              aria-describedby={`${id}-verdict-error`}
              className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1"
            >
              {choices.map((v) => (
                <option key={v} value={v}>
                  {v}
                </option>
              ))}
              {overridden ? (
                <option value="withdraw">withdraw the override (back to {computedVerdict})</option>
              ) : null}
            </select>
            <div
              id={`${id}-verdict-error`}
              aria-live="polite"
              className="text-xs text-red-700 dark:text-red-300"
            >
              {e.verdict?.join(" ")}
            </div>
          </div>
          <div className="flex min-w-64 flex-1 flex-col gap-1">
            <label htmlFor={`${id}-reason`} className="text-xs font-medium">
              Reason (required)
            </label>
            <textarea
              id={`${id}-reason`}
              name="reason"
              rows={2}
              required
              defaultValue={state.ok ? "" : state.values?.reason}
              aria-describedby={`${id}-reason-error`}
              aria-invalid={e.reason?.length ? true : undefined}
              className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1 aria-[invalid=true]:border-red-600"
            />
            <div
              id={`${id}-reason-error`}
              aria-live="polite"
              className="text-xs text-red-700 dark:text-red-300"
            >
              {e.reason?.join(" ")}
            </div>
          </div>
          <Button type="submit" variant="quiet" pending={pending}>
            {pending ? "Saving…" : "Save override"}
          </Button>
        </div>
        <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
      </form>
    </div>
  );
}
