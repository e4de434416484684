"use client";
// The calibrate form: the lamp spectrum chosen on the upload page, the lamp gases in it, and the model
// (left to the fit unless the chemist has a reason). The server pairs the peaks and fits.
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/form-message";
import { initialFormState, type FormState } from "@/lib/validation/form-state";

export function CalibrateForm({
  instrumentId,
  spectrumId,
  lampGases,
  models,
  action,
}: {
  instrumentId: string;
  spectrumId: string;
  lampGases: readonly string[];
  models: { value: string; label: string }[];
  action: (state: FormState, formData: FormData) => Promise<FormState>;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  const e = state.fieldErrors ?? {};
  return (
    <form action={formAction} className="panel flex max-w-2xl flex-col gap-4 p-4" noValidate>
      <input type="hidden" name="instrumentId" value={instrumentId} />
      <input type="hidden" name="spectrumId" value={spectrumId} />
      <fieldset aria-describedby="lamps-error">
        <legend className="mb-1 text-sm font-medium">Lamp gases in this spectrum</legend>
        <div className="flex flex-wrap gap-4 text-sm">
          {lampGases.map((gas) => (
            <label key={gas} className="flex items-center gap-1.5">
              <input type="checkbox" name="lamps" value={gas} defaultChecked={gas === "Hg"} />
              {gas}
            </label>
          ))}
        </div>
        <div id="lamps-error" aria-live="polite" className="text-xs text-red-700 dark:text-red-300">
          {e.lamps?.join(" ")}
        </div>
      </fieldset>
      <div className="flex flex-col gap-1">
        <label htmlFor="model" className="text-sm font-medium">
          Dispersion model
        </label>
        <select
          id="model"
          name="model"
          defaultValue="auto"
          aria-describedby="model-hint model-error"
          className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5"
        >
          {models.map((m) => (
            <option key={m.value} value={m.value}>
              {m.label}
            </option>
          ))}
        </select>
        <p id="model-hint" className="muted text-xs">
          A grating is close to linear in pixel; a prism is better described by the Hartmann formula or its glass.
        </p>
        <div id="model-error" aria-live="polite" className="text-xs text-red-700 dark:text-red-300">
          {e.model?.join(" ")}
        </div>
      </div>
      <FormMessage message={state.message ?? e.spectrumId?.join(" ")} />
      <div>
        <Button type="submit" pending={pending}>
          {pending ? "Pairing and fitting…" : "Pair the lines and fit"}
        </Button>
      </div>
    </form>
  );
}
