"use client";
// The draft's CSV import: choose or paste a file, see the preview, then apply exactly that preview.
// The text travels back in a hidden field with the preview's fingerprint, so the server refuses to
// apply a file or draft that changed since the preview.
import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { CsvFileInput } from "./csv-file-input";
import type { ImportFormState } from "@/lib/validation/line-forms";
import {
  IMPORT_TOO_LARGE_MESSAGE,
  MAX_IMPORT_BYTES,
  MAX_IMPORT_LABEL,
} from "@/lib/validation/line-schemas";
import { ImportPreview } from "./import-preview";

export function ImportPanel({
  releaseId,
  action,
}: {
  releaseId: string;
  /** Previews (intent "preview"), applies (intent "apply") or discards (intent "discard") an import. */
  action: (state: ImportFormState, formData: FormData) => Promise<ImportFormState>;
}) {
  const [state, formAction, pending] = useActionState(action, {} as ImportFormState);
  const [tooLarge, setTooLarge] = useState(false);
  const errors = state.fieldErrors ?? {};
  return (
    <div className="flex flex-col gap-4">
      {state.view && state.csv ? (
        <>
          <ImportPreview view={state.view} />
          <form
            action={formAction}
            className="flex flex-wrap items-end gap-3 border-t border-[var(--line)] pt-3"
          >
            <div className="w-full">
              <Field
                id="import-reason"
                name="reason"
                label="Reason for these changes"
                placeholder="CSV import"
                errors={errors.reason}
              />
            </div>
            <input type="hidden" name="releaseId" value={releaseId} />
            <input type="hidden" name="csv" value={state.csv} />
            <input type="hidden" name="fingerprint" value={state.view.preview.fingerprint} />
            <Button
              type="submit"
              name="intent"
              value="apply"
              pending={pending}
              disabled={state.view.addCount + state.view.changeCount === 0}
            >
              Apply these changes
            </Button>
            <Button type="submit" name="intent" value="discard" variant="quiet" disabled={pending}>
              Discard the preview
            </Button>
            <p className="muted text-xs">
              Writes the rows above to the draft in one step ({state.view.addCount} to add,{" "}
              {state.view.changeCount} to change); rejected rows are left out.
            </p>
            <div className="w-full">
              <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
            </div>
          </form>
        </>
      ) : (
        <form action={formAction} className="flex flex-col gap-3" encType="multipart/form-data">
          <input type="hidden" name="releaseId" value={releaseId} />
          <input type="hidden" name="intent" value="preview" />
          <div className="flex flex-col gap-1">
            <label htmlFor="import-file" className="text-sm font-medium">
              CSV file
            </label>
            <CsvFileInput id="import-file" maxBytes={MAX_IMPORT_BYTES} onTooLarge={setTooLarge} />
            <p id="import-file-hint" className="muted text-xs">
              Up to {MAX_IMPORT_LABEL} (the largest file one import takes), in the columns of an
              exported release: a file downloaded from any release imports as it is. Larger tables
              go in several files.
            </p>
            <div
              id="import-file-error"
              aria-live="polite"
              className="text-xs text-red-700 dark:text-red-300"
            >
              {tooLarge ? IMPORT_TOO_LARGE_MESSAGE : null}
            </div>
          </div>
          <div className="flex flex-col gap-1">
            <label htmlFor="import-csv" className="text-sm font-medium">
              Or paste the CSV
            </label>
            <textarea
              id="import-csv"
              name="csv"
              rows={5}
              spellCheck={false}
              aria-describedby="csv-error"
              aria-invalid={errors.csv ? true : undefined}
              className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5 font-mono text-xs aria-[invalid=true]:border-red-600"
              placeholder="species,air_nm,vacuum_nm,…,source,verified,note"
            />
            <div
              id="csv-error"
              aria-live="polite"
              className="text-xs text-red-700 dark:text-red-300"
            >
              {errors.csv?.join(" ")}
            </div>
          </div>
          <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
          <div>
            <Button type="submit" pending={pending} disabled={tooLarge}>
              Preview the import
            </Button>
          </div>
        </form>
      )}
    </div>
  );
}
