"use client";
// The lab lead's form for one line's values: a new line for the draft, or a correction of one.
// Inputs are named after the CSV columns, so the server checks them exactly as it checks an import.
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { LINE_FLAGS } from "@/lib/lines";
import type { LineRecord } from "@/lib/services/line-library-types";
import { SOURCE_KINDS } from "@/lib/spectrum/types";
import { initialFormState, type FormState } from "@/lib/validation/form-state";
import { FLAG_LABELS, SOURCE_LABELS } from "./line-values";

const text = (value: number | null | undefined) =>
  value === null || value === undefined ? "" : String(value);

export function LineForm({
  releaseId,
  line,
  action,
  submitLabel,
}: {
  releaseId: string;
  /** The line being corrected; omitted for a new line. */
  line?: LineRecord;
  action: (state: FormState, formData: FormData) => Promise<FormState>;
  submitLabel: string;
}) {
  const [state, formAction, pending] = useActionState(action, initialFormState);
  const errors = state.fieldErrors ?? {};
  return (
    <form
      action={formAction}
      className="flex flex-col gap-3"
      noValidate
      key={line ? `${line.id}-${line.version}` : "new"}
    >
      <input type="hidden" name="releaseId" value={releaseId} />
      {line ? (
        <>
          <input type="hidden" name="lineId" value={line.id} />
          <input type="hidden" name="version" value={line.version} />
          <input type="hidden" name="original_air_nm" value={text(line.airNm)} />
          <input type="hidden" name="original_vacuum_nm" value={text(line.vacuumNm)} />
        </>
      ) : null}
      <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Field
          name="species"
          label="Species"
          defaultValue={line?.species}
          errors={errors.species}
          hint='"Na I", "Ca II", "CaOH"'
          required
        />
        <Field
          name="air_nm"
          label="Air nm"
          inputMode="decimal"
          defaultValue={text(line?.airNm)}
          errors={errors.air_nm}
          hint={line ? undefined : "Computed from vacuum nm when blank"}
        />
        <Field
          name="vacuum_nm"
          label="Vacuum nm"
          inputMode="decimal"
          defaultValue={text(line?.vacuumNm)}
          errors={errors.vacuum_nm}
          hint={line ? "Edit one wavelength; the other follows" : "Computed from air nm when blank"}
        />
        <Field
          name="uncertainty_nm"
          label="± nm"
          inputMode="decimal"
          defaultValue={text(line?.uncertaintyNm)}
          errors={errors.uncertainty_nm}
        />
      </div>
      <fieldset className="grid grid-cols-2 gap-3 md:grid-cols-5">
        <legend className="mb-1 text-sm font-medium">
          Relative intensity per kind of source (blank where not known)
        </legend>
        {SOURCE_KINDS.map((kind) => (
          <Field
            key={kind}
            name={`intensity_${kind}`}
            label={SOURCE_LABELS[kind]}
            inputMode="decimal"
            defaultValue={text(line?.intensities[kind])}
            errors={errors[`intensity_${kind}`]}
          />
        ))}
      </fieldset>
      <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
        <Field
          name="lower_ev"
          label="E lower, eV"
          inputMode="decimal"
          defaultValue={text(line?.lowerEv)}
          errors={errors.lower_ev}
        />
        <Field
          name="upper_ev"
          label="E upper, eV"
          inputMode="decimal"
          defaultValue={text(line?.upperEv)}
          errors={errors.upper_ev}
        />
        <Field
          name="g_upper"
          label="g (upper)"
          inputMode="numeric"
          defaultValue={text(line?.g)}
          errors={errors.g_upper}
        />
        <Field
          name="a_per_s"
          label="A, s⁻¹"
          inputMode="decimal"
          defaultValue={text(line?.a)}
          errors={errors.a_per_s}
        />
      </div>
      <fieldset aria-describedby="flags-error">
        <legend className="mb-1 text-sm font-medium">Flags</legend>
        <div className="flex flex-wrap gap-3 text-sm">
          {LINE_FLAGS.map((flag) => (
            <label key={flag} className="flex items-center gap-1">
              <input
                type="checkbox"
                name="flags"
                value={flag}
                defaultChecked={line?.flags.includes(flag)}
              />{" "}
              {FLAG_LABELS[flag]}
            </label>
          ))}
        </div>
        <div id="flags-error" aria-live="polite" className="text-xs text-red-700 dark:text-red-300">
          {errors.flags?.join(" ")}
        </div>
      </fieldset>
      <div className="grid grid-cols-2 gap-3">
        <Field
          name="band_extent_nm"
          label="Band extent, nm"
          inputMode="decimal"
          defaultValue={text(line?.band?.extentNm)}
          errors={errors.band_extent_nm}
          hint="Band heads only"
        />
        <div className="flex flex-col gap-1">
          <label htmlFor="band_degrades_to" className="text-sm font-medium">
            Band fades towards
          </label>
          <select
            id="band_degrades_to"
            name="band_degrades_to"
            defaultValue={line?.band?.degradesTo ?? ""}
            aria-describedby="band_degrades_to-error"
            className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5"
          >
            <option value="">Not a band</option>
            <option value="red">the red</option>
            <option value="violet">the violet</option>
          </select>
          <div
            id="band_degrades_to-error"
            aria-live="polite"
            className="text-xs text-red-700 dark:text-red-300"
          >
            {errors.band_degrades_to?.join(" ")}
          </div>
        </div>
      </div>
      <Field
        name="source"
        label="Source (table, edition)"
        defaultValue={line?.source}
        errors={errors.source}
        required
      />
      <Field name="note" label="Note" defaultValue={line?.note} errors={errors.note} />
      <Field
        name="reason"
        label="Reason for this change"
        errors={errors.reason}
        required
        hint="Kept in the line's history"
      />
      <FormMessage
        message={[state.message, ...(errors._ ?? [])].filter(Boolean).join(" ")}
        tone={state.ok ? "ok" : "error"}
      />
      <div>
        <Button type="submit" pending={pending}>
          {submitLabel}
        </Button>
      </div>
    </form>
  );
}
