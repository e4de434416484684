// Notices every identification shows: what the tool's calls are worth, and for a flame the cautions.
import type { RunRecord } from "@/lib/runs/types";
import { WarningList } from "@/components/ui/warning-list";
import { FLAME_CAUTIONS } from "@/lib/reports/report-text";

export function ScreeningNotice() {
  return (
    <p className="muted text-sm" data-testid="screening-notice">
      A screening aid, not a certified analysis. Confirmation by an accredited method is the
      lab&apos;s decision.
    </p>
  );
}

export function FlameCautions() {
  return (
    <aside
      aria-label="Flame safety"
      className="rounded border border-ember-600 bg-ember-50 p-3 text-sm text-ember-900 dark:bg-ink-800 dark:text-ember-100"
    >
      <p className="font-semibold">
        <span aria-hidden>⚠ </span>Flame test cautions
      </p>
      <ul className="mt-1 list-disc pl-5">
        {FLAME_CAUTIONS.map((caution) => (
          <li key={caution}>{caution}</li>
        ))}
      </ul>
    </aside>
  );
}

/**
 * Everything a run's page says before its chart: the screening notice, whether the axis was
 * lamp-checked, the calibrated-range warning in the chemist's words (instead of the core's), the
 * run's other warnings and, for a flame, the cautions. `children` adds page-specific notes.
 */
export function RunNotices({
  run,
  coveredRangeNm,
  children,
}: {
  run: Pick<RunRecord, "lampChecked" | "rangeNm" | "warnings" | "source">;
  coveredRangeNm: [number, number] | null;
  children?: React.ReactNode;
}) {
  const outside =
    coveredRangeNm !== null &&
    (run.rangeNm[0] < coveredRangeNm[0] - 1e-9 || run.rangeNm[1] > coveredRangeNm[1] + 1e-9);
  const warnings = run.warnings.filter((w) => !(outside && w.code === "outside-covered-range"));
  return (
    <div className="mb-3 flex flex-col gap-2">
      <ScreeningNotice />
      {!run.lampChecked ? (
        <p className="text-sm" data-testid="not-lamp-checked">
          <span className="rounded border border-ember-600 px-1.5 py-0.5 text-xs font-semibold text-ember-800 dark:text-ember-200">
            <span aria-hidden>◇ </span>Not lamp-checked
          </span>{" "}
          This run used the file&apos;s own wavelength axis, not a lamp calibration.
        </p>
      ) : null}
      {outside ? (
        <p
          role="alert"
          className="rounded border border-ember-600 p-2 text-sm"
          data-testid="range-warning"
        >
          <span aria-hidden>⚠ </span>The sample spans {run.rangeNm[0].toFixed(1)}–
          {run.rangeNm[1].toFixed(1)} nm, past the calibrated range {coveredRangeNm[0].toFixed(1)}–
          {coveredRangeNm[1].toFixed(1)} nm: wavelengths outside it are extrapolated.
        </p>
      ) : null}
      <WarningList warnings={warnings} />
      {run.source === "flame" ? <FlameCautions /> : null}
      {children}
    </div>
  );
}
