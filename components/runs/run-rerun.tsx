"use client";
// "Run again on release N": a new run of the same sample against the team's newest line-table release.
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";
import { PendingStatus } from "@/components/ui/pending-status";

export function RunRerunButton({
  releaseNumber,
  action,
}: {
  releaseNumber: number;
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  return (
    <form action={formAction} className="flex flex-col items-end gap-1">
      <Button type="submit" variant="quiet" pending={pending} data-testid="rerun">
        {pending ? "Analysing…" : `Run again on release ${releaseNumber}`}
      </Button>
      <PendingStatus
        pending={pending}
        text={`Analysing the sample again against release ${releaseNumber}.`}
      />
      <FormMessage message={state.message} />
    </form>
  );
}
