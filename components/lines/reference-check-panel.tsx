"use client";
// The lab lead's check of the draft against a reference file: choose the file and its medium, see which
// rows agree within the combined uncertainty and which disagree (each with a decision), then confirm
// the whole step at once. The file travels back in a hidden field with the preview's fingerprint.
import { useActionState, useState } from "react";
import Link from "next/link";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { CsvFileInput } from "./csv-file-input";
import type { ReferenceCheckFormState } from "@/lib/validation/line-forms";
import {
  MAX_REFERENCE_BYTES,
  MAX_REFERENCE_LABEL,
  REFERENCE_TOO_LARGE_MESSAGE,
} from "@/lib/validation/line-schemas";
import type { ReferenceCheckPair } from "@/lib/services/line-library-types";

type Decision = "leave" | "keep" | "take";

const nm = (value: number) => value.toFixed(4);
const signedNm = (value: number) => `${value >= 0 ? "+" : "−"}${Math.abs(value).toFixed(4)}`;

function PairTable({
  pairs,
  caption,
  testId,
  decide,
}: {
  pairs: ReferenceCheckPair[];
  caption: string;
  testId: string;
  decide?: { decisions: Record<string, Decision>; onChange: (id: string, d: Decision) => void };
}) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-xs tabular" data-testid={testId}>
        <caption className="sr-only">{caption}</caption>
        <thead className="muted">
          <tr>
            <th scope="col" className="py-1 pr-2 font-medium">
              Line
            </th>
            <th scope="col" className="pr-2 font-medium">
              Medium
            </th>
            <th scope="col" className="pr-2 text-right font-medium">
              Draft nm
            </th>
            <th scope="col" className="pr-2 text-right font-medium">
              Reference nm
            </th>
            <th scope="col" className="pr-2 text-right font-medium">
              Difference nm
            </th>
            <th scope="col" className="pr-2 text-right font-medium">
              Combined uncertainty nm
            </th>
            <th scope="col" className="pr-2 font-medium">
              Citation
            </th>
            {decide ? (
              <th scope="col" className="font-medium">
                Decision
              </th>
            ) : null}
          </tr>
        </thead>
        <tbody className="divide-line">
          {pairs.map((p) => (
            <tr key={p.lineId} className="align-top">
              <th scope="row" className="py-1 pr-2 font-medium whitespace-nowrap">
                {p.species} {p.draftNm.toFixed(3)}
                {p.verified ? <span className="muted"> (verified)</span> : null}
              </th>
              <td className="pr-2">{p.medium}</td>
              <td className="pr-2 text-right">{nm(p.draftNm)}</td>
              <td className="pr-2 text-right">{nm(p.referenceNm)}</td>
              <td className="pr-2 text-right">{signedNm(p.differenceNm)}</td>
              <td className="pr-2 text-right">
                {nm(p.combinedUncertaintyNm)}
                {p.toleranceNm > p.combinedUncertaintyNm ? (
                  <span className="muted"> (allowed {nm(p.toleranceNm)})</span>
                ) : null}
                {p.draftUncertaintyNm === null ? (
                  <span className="muted"> (draft states none)</span>
                ) : null}
              </td>
              <td className="pr-2">
                {p.citation} <span className="muted">· file line {p.csvLine}</span>
              </td>
              {decide ? (
                <td>
                  <fieldset className="flex flex-wrap gap-x-3 gap-y-1">
                    <legend className="sr-only">
                      Decision for {p.species} {p.draftNm.toFixed(3)} nm
                    </legend>
                    {(
                      [
                        ["leave", "Leave"],
                        ["keep", "Keep ours"],
                        ["take", "Take the reference value"],
                      ] as const
                    ).map(([value, label]) => (
                      <label key={value} className="inline-flex items-center gap-1">
                        <input
                          type="radio"
                          name={`decision:${p.lineId}`}
                          value={value}
                          checked={(decide.decisions[p.lineId] ?? "leave") === value}
                          onChange={() => decide.onChange(p.lineId, value)}
                        />
                        {label}
                      </label>
                    ))}
                  </fieldset>
                </td>
              ) : null}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export function ReferenceCheckPanel({
  releaseId,
  action,
}: {
  releaseId: string;
  /** Checks (intent "preview"), confirms (intent "apply") or discards (intent "discard") a check. */
  action: (state: ReferenceCheckFormState, formData: FormData) => Promise<ReferenceCheckFormState>;
}) {
  const [state, formAction, pending] = useActionState(action, {} as ReferenceCheckFormState);
  const [tooLarge, setTooLarge] = useState(false);
  const [decisions, setDecisions] = useState<Record<string, Decision>>({});
  const errors = state.fieldErrors ?? {};

  if (state.applied) {
    return (
      <div className="flex flex-col gap-3" data-testid="reference-applied">
        <FormMessage message={state.message} tone="ok" />
        <p className="text-sm">
          <Link href="/lines/draft?verified=yes" className="underline">
            Show the verified rows of the draft
          </Link>{" "}
          ·{" "}
          <Link href="/lines/draft?verified=no" className="underline">
            Show the rows still unverified
          </Link>
        </p>
        <form action={formAction}>
          <Button type="submit" name="intent" value="discard" variant="quiet">
            Check another file
          </Button>
        </form>
      </div>
    );
  }

  const preview = state.preview;
  if (preview && state.csv) {
    const taking = preview.disagreeing.filter((p) => decisions[p.lineId] === "take");
    const keeping = preview.disagreeing.filter((p) => decisions[p.lineId] === "keep");
    const toVerify = preview.agreeing.length + taking.length;
    const citations = [...new Set([...preview.agreeing, ...taking].map((p) => p.citation))];
    const citationWords =
      citations.length === 1
        ? `citation “${citations[0]}”`
        : `their citations (${citations.length} sources)`;
    const rows = (n: number) => `${n} ${n === 1 ? "row" : "rows"}`;
    return (
      <form action={formAction} className="flex flex-col gap-5" data-testid="reference-preview">
        <p role="status" className="text-sm">
          {preview.referenceLineCount} reference lines: {rows(preview.agreeing.length)} agree within
          the combined uncertainty, {preview.disagreeing.length} disagree,{" "}
          {preview.alreadyVerified.length} already verified agree, {preview.referenceOnly.length}{" "}
          {preview.referenceOnly.length === 1 ? "has" : "have"} no draft row, and{" "}
          {rows(preview.draftOnly.length)} of the same species in the draft{" "}
          {preview.draftOnly.length === 1 ? "has" : "have"} no reference line. Agreement means the
          difference is at most {preview.coverageFactor === 1 ? "" : `${preview.coverageFactor} × `}
          the combined uncertainty √(u<sub>draft</sub>² + u<sub>reference</sub>²), and never less
          than {preview.minToleranceNm} nm; each line is compared in the medium its reference
          states. Nothing is written until you confirm.
        </p>

        <section aria-labelledby="ref-agree-heading">
          <h3 id="ref-agree-heading" className="mb-1 text-sm font-semibold">
            Agree: to be marked verified ({preview.agreeing.length})
          </h3>
          {preview.agreeing.length ? (
            <PairTable
              pairs={preview.agreeing}
              caption="Draft rows that agree with the reference"
              testId="reference-agreeing"
            />
          ) : (
            <p className="muted text-sm">No unverified draft row agrees with this file.</p>
          )}
        </section>

        <section aria-labelledby="ref-disagree-heading">
          <h3 id="ref-disagree-heading" className="mb-1 text-sm font-semibold">
            Disagree: your decision ({preview.disagreeing.length})
          </h3>
          {preview.disagreeing.length ? (
            <>
              <p className="muted mb-1 text-xs">
                Keep ours records that you kept the draft value (it stays unverified); taking the
                reference value replaces the row&apos;s wavelength and uncertainty and marks it
                verified; leave decides nothing now.
              </p>
              <PairTable
                pairs={preview.disagreeing}
                caption="Draft rows that disagree with the reference"
                testId="reference-disagreeing"
                decide={{
                  decisions,
                  onChange: (id, d) => setDecisions((current) => ({ ...current, [id]: d })),
                }}
              />
            </>
          ) : (
            <p className="muted text-sm">No draft row disagrees with this file.</p>
          )}
        </section>

        <section aria-labelledby="ref-only-heading">
          <h3 id="ref-only-heading" className="mb-1 text-sm font-semibold">
            Reference lines with no draft row ({preview.referenceOnly.length})
          </h3>
          {preview.referenceOnly.length ? (
            <ul className="text-xs tabular" data-testid="reference-only">
              {preview.referenceOnly.map((r) => (
                <li key={r.csvLine}>
                  {r.species} {r.wavelengthNm} nm ({r.medium}) ± {r.uncertaintyNm} nm · {r.citation}{" "}
                  <span className="muted">· file line {r.csvLine}</span>
                </li>
              ))}
            </ul>
          ) : (
            <p className="muted text-sm">Every reference line found its draft row.</p>
          )}
          <p className="muted mt-1 text-xs">
            Add such a line in the draft if the team needs it; the check does not add lines.
          </p>
        </section>

        <section aria-labelledby="draft-only-heading">
          <h3 id="draft-only-heading" className="mb-1 text-sm font-semibold">
            Draft rows with no reference line ({preview.draftOnly.length})
          </h3>
          {preview.draftOnly.length ? (
            <ul className="text-xs tabular" data-testid="draft-only">
              {preview.draftOnly.map((r) => (
                <li key={r.lineId}>
                  {r.species} {r.airNm ?? r.vacuumNm} nm{r.airNm === null ? " (vacuum)" : ""}
                  {r.verified ? " (verified)" : ""}
                </li>
              ))}
            </ul>
          ) : (
            <p className="muted text-sm">Every draft row of these species has a reference line.</p>
          )}
          <p className="muted mt-1 text-xs">
            Only species the file names are compared; {preview.otherSpeciesCount} draft rows of
            other species and {preview.retiredCount} retired rows were left out.
          </p>
        </section>

        {preview.alreadyVerified.length ? (
          <details>
            <summary className="cursor-pointer text-sm font-semibold">
              Already verified and agreeing ({preview.alreadyVerified.length}): left as they are
            </summary>
            <PairTable
              pairs={preview.alreadyVerified}
              caption="Verified draft rows that agree with the reference"
              testId="reference-already-verified"
            />
          </details>
        ) : null}

        <div className="flex flex-wrap items-end gap-3 border-t border-[var(--line)] pt-3">
          <div className="w-full">
            <Field
              id="reference-reason"
              name="reason"
              label="Reason for the audit trail"
              placeholder="Checked against a reference"
              errors={errors.reason}
            />
          </div>
          <input type="hidden" name="releaseId" value={releaseId} />
          <input type="hidden" name="csv" value={state.csv} />
          <input type="hidden" name="medium" value={state.medium ?? ""} />
          <input type="hidden" name="fingerprint" value={preview.fingerprint} />
          <Button
            type="submit"
            name="intent"
            value="apply"
            pending={pending}
            disabled={toVerify + keeping.length === 0}
          >
            {toVerify > 0
              ? `Mark ${rows(toVerify)} verified with ${citationWords}`
              : `Record ${rows(keeping.length)} kept`}
          </Button>
          <Button type="submit" name="intent" value="discard" variant="quiet" disabled={pending}>
            Discard this check
          </Button>
          <p className="muted w-full text-xs">
            One step, recorded once in the audit trail with the file&apos;s SHA-256
            {keeping.length ? `; ${rows(keeping.length)} kept as ours` : ""}.
          </p>
          <div className="w-full">
            <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
          </div>
        </div>
      </form>
    );
  }

  return (
    <form action={formAction} className="flex flex-col gap-3" encType="multipart/form-data">
      <input type="hidden" name="releaseId" value={releaseId} />
      <input type="hidden" name="intent" value="preview" />
      <div className="flex flex-col gap-1">
        <label htmlFor="reference-file" className="text-sm font-medium">
          Reference CSV file
        </label>
        <CsvFileInput id="reference-file" maxBytes={MAX_REFERENCE_BYTES} onTooLarge={setTooLarge} />
        <p id="reference-file-hint" className="muted text-xs">
          Up to {MAX_REFERENCE_LABEL}: a header row with the columns <code>species</code>,{" "}
          <code>wavelength_nm</code>, <code>uncertainty_nm</code> (one sigma, nm),{" "}
          <code>citation</code> and optionally <code>medium</code> (<code>air</code> or{" "}
          <code>vacuum</code>), then one reference line per row; other columns are ignored and lines
          starting with # are comments.
        </p>
        <div
          id="reference-file-error"
          aria-live="polite"
          className="text-xs text-red-700 dark:text-red-300"
        >
          {tooLarge ? REFERENCE_TOO_LARGE_MESSAGE : errors.csv?.join(" ")}
        </div>
      </div>
      <div className="flex flex-col gap-1">
        <label htmlFor="reference-medium" className="text-sm font-medium">
          Medium of the wavelengths
        </label>
        <select
          id="reference-medium"
          name="medium"
          defaultValue=""
          aria-describedby="reference-medium-error"
          className="w-fit rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5 text-sm"
        >
          <option value="">As the file&apos;s medium column says</option>
          <option value="air">Standard air, for every row without a medium</option>
          <option value="vacuum">Vacuum, for every row without a medium</option>
        </select>
        <div
          id="reference-medium-error"
          aria-live="polite"
          className="text-xs text-red-700 dark:text-red-300"
        >
          {errors.medium?.join(" ")}
        </div>
      </div>
      <FormMessage message={state.message} tone={state.ok ? "ok" : "error"} />
      <div>
        <Button type="submit" pending={pending} disabled={tooLarge}>
          Check the draft against this file
        </Button>
      </div>
    </form>
  );
}
