// The core's comparison of the dispersion models on the same pairs: RMS, AICc, BIC and where each model
// puts the array's first and last pixel (with its 1σ), the recommended and the chosen ones named in text.
import type { CalibrationPreview } from "@/lib/services/calibrations";
import { TableScroll } from "@/components/ui/table-scroll";

const fixed = (v: number | null, digits: number) => (v === null ? "—" : v.toFixed(digits));

export function ModelComparison({
  comparison,
  chosenModel,
  labels,
}: {
  comparison: CalibrationPreview["comparison"];
  /** The model label of the current fit ("polynomial-3"). */
  chosenModel: string;
  labels: Record<string, string>;
}) {
  return (
    <TableScroll label="Models compared" className="panel">
      <table className="w-full text-sm" data-testid="model-comparison">
        <caption className="px-3 py-2 text-left">
          <span className="font-semibold">Models compared on the same pairs</span>
          <span className="muted block text-xs">
            Lower AICc and BIC are better; models within 2 of the best AICc are equally supported.
            Recommended: {comparison.reason}.
          </span>
        </caption>
        <thead className="border-b border-[var(--line)] text-left">
          <tr>
            <th scope="col" className="px-3 py-2">
              Model
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              Parameters
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              RMS (nm)
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              AICc
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              BIC
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              λ at first pixel (nm)
            </th>
            <th scope="col" className="px-3 py-2 text-right">
              λ at last pixel (nm)
            </th>
            <th scope="col" className="px-3 py-2">
              Note
            </th>
          </tr>
        </thead>
        <tbody>
          {comparison.candidates.map((c) => {
            const notes = [
              c.model === comparison.recommended ? "recommended" : null,
              c.model === chosenModel ? "in use" : null,
              glassNote(c),
              c.failure,
            ].filter(Boolean);
            return (
              <tr
                key={c.model}
                className={`border-b border-[var(--line)] last:border-0 ${c.model === chosenModel ? "bg-ember-50 dark:bg-ink-800" : ""}`}
              >
                <th scope="row" className="px-3 py-1.5 text-left font-normal whitespace-nowrap">
                  {labels[c.model] ?? c.model}
                </th>
                <td className="px-3 py-1.5 text-right font-mono">{c.parameterCount ?? "—"}</td>
                <td className="px-3 py-1.5 text-right font-mono">{fixed(c.rmsNm, 4)}</td>
                <td className="px-3 py-1.5 text-right font-mono">{fixed(c.aicc, 1)}</td>
                <td className="px-3 py-1.5 text-right font-mono">{fixed(c.bic, 1)}</td>
                {[0, 1].map((end) => (
                  <td key={end} className="px-3 py-1.5 text-right font-mono whitespace-nowrap">
                    {c.ends
                      ? `${c.ends[end].wavelengthNm.toFixed(2)} ± ${c.ends[end].uncertaintyNm.toFixed(3)}`
                      : "—"}
                  </td>
                ))}
                <td className="px-3 py-1.5 text-xs">{notes.join(" · ")}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </TableScroll>
  );
}

/** The prism's glass in words: the catalogue's, or fitted from the pairs and where it started. */
function glassNote(row: { glass: string | null; glassFitted: boolean }): string | null {
  if (!row.glass) return null;
  return row.glassFitted
    ? `glass fitted from the pairs (started from ${row.glass})`
    : `glass ${row.glass}`;
}
