// The workbench's pairs: every pair of the pairing and every one made by hand, with its residual, where
// it came from, whether the fit used it, and the one action that changes it (exclude, include, remove).
import type { CalibrationPreview, CalibrationPreviewPair } from "@/lib/services/calibrations";
import { TableScroll } from "@/components/ui/table-scroll";
import { OutsideCoveredNote } from "./outside-covered-note";

const STATE_TEXT: Record<
  CalibrationPreviewPair["state"],
  { mark: string; text: string; className: string }
> = {
  used: { mark: "▼", text: "in the fit", className: "text-teal-700 dark:text-teal-300" },
  rejected: { mark: "✕", text: "rejected by the fit", className: "text-red-700 dark:text-red-300" },
  excluded: {
    mark: "◇",
    text: "excluded by hand",
    className: "text-ember-700 dark:text-ember-300",
  },
};

export function WorkbenchPairsTable({
  pairs,
  coveredRangeNm,
  xTitle,
  disabled,
  onExclude,
  onInclude,
  onRemove,
}: {
  pairs: CalibrationPreview["result"]["pairs"];
  /** The covered range the calibration claims: a used pair outside it is marked. */
  coveredRangeNm: readonly [number, number];
  xTitle: string;
  disabled: boolean;
  onExclude: (pair: CalibrationPreviewPair) => void;
  onInclude: (pair: CalibrationPreviewPair) => void;
  onRemove: (pair: CalibrationPreviewPair) => void;
}) {
  return (
    <TableScroll label="Pairs of lamp peaks and lines" className="panel">
      <table className="w-full text-sm whitespace-nowrap" data-testid="workbench-pairs">
        <caption className="px-3 py-2 text-left font-semibold">
          Pairs of lamp peaks and lines
        </caption>
        <thead className="border-b border-[var(--line)] text-left">
          <tr>
            <th scope="col" className="px-3 py-2 text-right">
              {xTitle}
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              Line λ (nm)
            </th>
            <th scope="col" className="px-3 py-2">
              Species
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              Residual (nm)
            </th>
            <th scope="col" className="px-3 py-2">
              Paired
            </th>
            <th scope="col" className="px-3 py-2">
              State
            </th>
            <th scope="col" className="px-3 py-2">
              <span className="sr-only">Action</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {pairs.map((p) => {
            const state = STATE_TEXT[p.state];
            const what = `the pair at pixel ${p.pixel.toFixed(2)} (${p.species ?? "line"} ${p.wavelengthNm.toFixed(3)} nm)`;
            return (
              <tr
                key={`${p.pixel}-${p.wavelengthNm}`}
                data-state={p.state}
                className="border-b border-[var(--line)] last:border-0"
              >
                <td className="px-3 py-1.5 text-right font-mono">{p.pixel.toFixed(2)}</td>
                <td className="px-3 py-1.5 text-right font-mono">{p.wavelengthNm.toFixed(3)}</td>
                <td className="px-3 py-1.5">{p.species ?? "—"}</td>
                <td className="px-3 py-1.5 text-right font-mono">{p.residualNm.toFixed(4)}</td>
                <td className="px-3 py-1.5">
                  {p.origin === "added" ? "by hand" : "automatically"}
                </td>
                <td className="px-3 py-1.5">
                  <span aria-hidden className={state.className}>
                    {state.mark}{" "}
                  </span>
                  {state.text}
                  {p.state === "used" ? (
                    <OutsideCoveredNote pair={p} coveredRangeNm={coveredRangeNm} />
                  ) : null}
                </td>
                <td className="px-3 py-1.5 text-right">
                  {p.origin === "added" ? (
                    <button
                      type="button"
                      disabled={disabled}
                      onClick={() => onRemove(p)}
                      aria-label={`Remove ${what}`}
                      className="rounded border border-[var(--line)] px-2 py-0.5 text-xs hover:bg-ink-100 disabled:opacity-50 dark:hover:bg-ink-800"
                    >
                      Remove
                    </button>
                  ) : p.state === "excluded" ? (
                    <button
                      type="button"
                      disabled={disabled}
                      onClick={() => onInclude(p)}
                      aria-label={`Include ${what}`}
                      className="rounded border border-[var(--line)] px-2 py-0.5 text-xs hover:bg-ink-100 disabled:opacity-50 dark:hover:bg-ink-800"
                    >
                      Include
                    </button>
                  ) : (
                    <button
                      type="button"
                      disabled={disabled}
                      onClick={() => onExclude(p)}
                      aria-label={`Exclude ${what}`}
                      className="rounded border border-[var(--line)] px-2 py-0.5 text-xs hover:bg-ink-100 disabled:opacity-50 dark:hover:bg-ink-800"
                    >
                      Exclude
                    </button>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </TableScroll>
  );
}
