"use client";
// One draft row's changes: retire or restore it, mark it verified, or open its correction form;
// each asks for a reason, and a row someone else changed first answers with the conflict message.
import Link from "next/link";
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

export function LineChangeForm({
  line,
  correctHref,
  action,
}: {
  line: {
    id: string;
    species: string;
    airNm: number | null;
    vacuumNm: number;
    version: number;
    retired: boolean;
    verified: boolean;
  };
  correctHref: string;
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  const name = `${line.species} ${line.airNm ?? line.vacuumNm} nm`;
  const reasonId = `reason-${line.id}`;
  const errorId = `reason-${line.id}-error`;
  return (
    <details className="group w-40 text-xs" open={Boolean(state.message) || undefined}>
      <summary className="cursor-pointer text-ember-700 select-none hover:underline dark:text-ember-300">
        Change<span className="sr-only"> {name}</span>…
      </summary>
      <form
        action={formAction}
        className="mt-1 flex flex-col gap-1.5"
        aria-label={`Change ${name}`}
      >
        <input type="hidden" name="lineId" value={line.id} />
        <input type="hidden" name="version" value={line.version} />
        <label htmlFor={reasonId} className="font-medium">
          Reason
        </label>
        <input
          id={reasonId}
          name="reason"
          required
          aria-describedby={errorId}
          aria-invalid={state.fieldErrors?.reason ? true : undefined}
          className="rounded border border-[var(--line)] bg-[var(--panel)] px-1.5 py-0.5 aria-[invalid=true]:border-red-600"
        />
        <div id={errorId} aria-live="polite" className="text-red-700 dark:text-red-300">
          {state.fieldErrors?.reason?.join(" ")}
        </div>
        <div className="flex flex-wrap gap-1">
          {line.retired ? (
            <Button
              type="submit"
              name="change"
              value="restore"
              variant="quiet"
              pending={pending}
              className="px-2 py-0.5 text-xs"
            >
              Restore
            </Button>
          ) : (
            <Button
              type="submit"
              name="change"
              value="retire"
              variant="danger"
              pending={pending}
              className="px-2 py-0.5 text-xs"
            >
              Retire
            </Button>
          )}
          {line.verified ? null : (
            <Button
              type="submit"
              name="change"
              value="verify"
              variant="quiet"
              pending={pending}
              className="px-2 py-0.5 text-xs"
            >
              Mark verified
            </Button>
          )}
          <Link href={correctHref} className="self-center underline">
            Correct values
          </Link>
        </div>
        <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
      </form>
    </details>
  );
}
