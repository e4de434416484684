"use client";
// The small chooser that pairs one unpaired lamp peak with a lamp line: the lines nearest the
// wavelength the current fit predicts for the peak, each a button; Escape or Cancel closes it.
import { useEffect, useRef } from "react";
import type { CalibrationPreview } from "@/lib/services/calibrations";

/** How many of the nearest lines are offered. */
const OFFERED = 6;

export function PairChooser({
  peak,
  lines,
  onChoose,
  onClose,
}: {
  peak: CalibrationPreview["peaks"][number];
  lines: CalibrationPreview["lines"];
  onChoose: (wavelengthNm: number) => void;
  onClose: () => void;
}) {
  const first = useRef<HTMLButtonElement>(null);
  useEffect(() => first.current?.focus(), [peak.pixel]);
  const predicted = peak.predictedNm;
  const nearest =
    predicted === null
      ? lines.slice(0, OFFERED)
      : lines
          .map((l) => ({ l, d: l.wavelengthNm - predicted }))
          .sort((a, b) => Math.abs(a.d) - Math.abs(b.d))
          .slice(0, OFFERED)
          .map(({ l }) => l);
  return (
    <div
      role="dialog"
      aria-labelledby="pair-chooser-title"
      data-testid="pair-chooser"
      className="panel border-ember-600 p-3"
      onKeyDown={(event) => {
        if (event.key === "Escape") {
          event.stopPropagation();
          onClose();
        }
      }}
    >
      <h3 id="pair-chooser-title" className="mb-1 text-sm font-semibold">
        Pair the peak at pixel {peak.pixel.toFixed(2)}
      </h3>
      <p className="muted mb-2 text-xs">
        {predicted === null
          ? "The current fit does not reach this peak; the lines are listed by wavelength."
          : `The current fit puts it at ${predicted.toFixed(3)} nm. Nearest lamp lines:`}
      </p>
      {nearest.length === 0 ? (
        <p className="text-sm">No lamp lines of the chosen gases in the nominal range.</p>
      ) : (
        <ul className="flex flex-col gap-1">
          {nearest.map((l, i) => (
            <li key={l.lineId}>
              <button
                ref={i === 0 ? first : undefined}
                type="button"
                onClick={() => onChoose(l.wavelengthNm)}
                className="flex w-full items-center gap-3 rounded border border-[var(--line)] px-2 py-1 text-left text-sm hover:bg-ink-100 focus:outline-2 focus:outline-ember-600 dark:hover:bg-ink-800"
              >
                <span className="w-16">{l.species}</span>
                <span className="w-24 font-mono">{l.wavelengthNm.toFixed(3)} nm</span>
                {predicted !== null ? (
                  <span className="muted w-24 font-mono text-xs">
                    Δ{" "}
                    {(l.wavelengthNm - predicted >= 0 ? "+" : "") +
                      (l.wavelengthNm - predicted).toFixed(3)}
                  </span>
                ) : null}
                <span className="muted text-xs">intensity {l.intensity}</span>
                {l.paired ? (
                  <span className="muted text-xs">(paired elsewhere: moves here)</span>
                ) : null}
              </button>
            </li>
          ))}
        </ul>
      )}
      <div className="mt-2">
        <button
          type="button"
          onClick={onClose}
          className="rounded border border-[var(--line)] px-2 py-1 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
        >
          Cancel
        </button>
      </div>
    </div>
  );
}
