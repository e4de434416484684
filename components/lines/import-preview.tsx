// What an import would do to the draft, before anything is written: the rows it adds, the rows it
// changes (each changed field old → new) and the rows it rejects, located by file line and column.
import type { LineTableRow } from "@/lib/lines";
import { countOf } from "@/lib/text/count-of";
import type { ImportPreviewView } from "@/lib/validation/line-forms";
import { Flags, SOURCE_LABELS, Value } from "./line-values";
import { TableScroll } from "@/components/ui/table-scroll";

const FIELD_LABELS: Record<string, string> = {
  species: "species",
  airNm: "air nm",
  vacuumNm: "vacuum nm",
  uncertaintyNm: "± nm",
  intensities: "intensities",
  lowerEv: "E lower eV",
  upperEv: "E upper eV",
  gUpper: "g",
  aPerS: "A s⁻¹",
  flags: "flags",
  band: "band",
  source: "source",
  verified: "verified",
  note: "note",
};

// Change lists may name fields as the row does (airNm) or as the CSV does (air_nm).
const CSV_TO_ROW: Record<string, keyof LineTableRow> = {
  air_nm: "airNm",
  vacuum_nm: "vacuumNm",
  uncertainty_nm: "uncertaintyNm",
  lower_ev: "lowerEv",
  upper_ev: "upperEv",
  g_upper: "gUpper",
  a_per_s: "aPerS",
  band_extent_nm: "band",
  band_degrades_to: "band",
};

function FieldValue({ row, field }: { row: LineTableRow; field: string }) {
  if (field.startsWith("intensity_")) {
    const kind = field.slice("intensity_".length) as keyof LineTableRow["intensities"];
    return <Value value={row.intensities[kind]} />;
  }
  const key = (CSV_TO_ROW[field] ?? field) as keyof LineTableRow;
  const value = row[key];
  if (key === "flags") return <Flags flags={row.flags} />;
  if (key === "intensities") {
    const entries = Object.entries(row.intensities);
    return (
      <>
        {entries.length
          ? entries
              .map(
                ([kind, v]) => `${SOURCE_LABELS[kind as keyof typeof SOURCE_LABELS] ?? kind} ${v}`,
              )
              .join(", ")
          : "–"}
      </>
    );
  }
  if (key === "band")
    return <>{row.band ? `${row.band.extentNm} nm, fades to the ${row.band.degradesTo}` : "–"}</>;
  if (typeof value === "number" || value === null)
    return <Value value={value} exponent={key === "aPerS"} />;
  if (typeof value === "boolean") return <>{value ? "yes" : "no"}</>;
  return <>{value === "" || value === undefined ? "–" : String(value)}</>;
}

/** A change of intensities shown as one change per kind of source that differs. */
function perKind(before: LineTableRow, after: LineTableRow, field: string): string[] {
  if (field !== "intensities") return [field];
  const kinds = new Set([
    ...Object.keys(before.intensities),
    ...Object.keys(after.intensities),
  ]) as Set<keyof LineTableRow["intensities"]>;
  return [...kinds]
    .filter((kind) => before.intensities[kind] !== after.intensities[kind])
    .map((kind) => `intensity_${kind}`);
}

function fieldLabel(field: string): string {
  if (field.startsWith("intensity_")) return `intensity, ${field.slice("intensity_".length)}`;
  return FIELD_LABELS[field] ?? field.replace(/_/g, " ");
}

function More({ shown, total }: { shown: number; total: number }) {
  if (total <= shown) return null;
  return (
    <p className="muted mt-1 text-xs">
      Showing the first {shown.toLocaleString("en")} of {total.toLocaleString("en")}.
    </p>
  );
}

export function ImportPreview({ view }: { view: ImportPreviewView }) {
  const { preview, addCount, changeCount, errorCount } = view;
  return (
    <div className="flex flex-col gap-4" data-testid="import-preview">
      <p className="text-sm" role="status">
        <strong>{addCount.toLocaleString("en")}</strong> to add,{" "}
        <strong>{changeCount.toLocaleString("en")}</strong> to change,{" "}
        <strong>{errorCount.toLocaleString("en")}</strong> rejected;{" "}
        {countOf(preview.unchangedCount, "row")} {preview.unchangedCount === 1 ? "is" : "are"}{" "}
        already as in the draft. Nothing is written until you apply.
      </p>

      <section aria-labelledby="preview-adds" data-testid="preview-adds">
        <h3 id="preview-adds" className="mb-1 text-sm font-semibold">
          <span aria-hidden>+</span> Rows to add ({addCount.toLocaleString("en")})
        </h3>
        {addCount === 0 ? (
          <p className="muted text-sm">None.</p>
        ) : (
          <TableScroll label="Rows to add">
            <table className="w-full text-sm tabular">
              <thead className="muted text-left text-xs">
                <tr>
                  <th className="px-2 py-1 font-medium whitespace-nowrap">File line</th>
                  <th className="px-2 py-1 font-medium">Species</th>
                  <th className="px-2 py-1 text-right font-medium">Air nm</th>
                  <th className="px-2 py-1 text-right font-medium">Vacuum nm</th>
                  <th className="px-2 py-1 font-medium">Flags</th>
                  <th className="px-2 py-1 font-medium">Source</th>
                </tr>
              </thead>
              <tbody className="divide-line">
                {preview.adds.map(({ csvLine, row }) => (
                  <tr key={csvLine}>
                    <td className="px-2 py-1">{csvLine}</td>
                    <td className="px-2 py-1 font-medium">{row.species}</td>
                    <td className="px-2 py-1 text-right">
                      <Value value={row.airNm} decimals={4} />
                    </td>
                    <td className="px-2 py-1 text-right">
                      <Value value={row.vacuumNm} decimals={4} />
                    </td>
                    <td className="px-2 py-1">
                      <Flags flags={row.flags} />
                    </td>
                    <td className="max-w-72 truncate px-2 py-1" title={row.source}>
                      {row.source}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </TableScroll>
        )}
        <More shown={preview.adds.length} total={addCount} />
      </section>

      <section aria-labelledby="preview-changes" data-testid="preview-changes">
        <h3 id="preview-changes" className="mb-1 text-sm font-semibold">
          <span aria-hidden>~</span> Rows that change ({changeCount.toLocaleString("en")})
        </h3>
        {changeCount === 0 ? (
          <p className="muted text-sm">None.</p>
        ) : (
          <ul className="divide-line text-sm">
            {preview.changes.map((change) => (
              <li key={change.lineId} className="py-1.5">
                <p>
                  <span className="font-medium">
                    {change.after.species} {change.after.airNm ?? change.after.vacuumNm} nm
                  </span>{" "}
                  <span className="muted">· file line {change.csvLine}</span>
                </p>
                <dl className="mt-0.5 grid grid-cols-[8rem_1fr] gap-x-3 text-xs tabular">
                  {change.fields
                    .flatMap((field) => perKind(change.before, change.after, field))
                    .map((field) => (
                      <div key={field} className="contents">
                        <dt className="muted">{fieldLabel(field)}</dt>
                        <dd>
                          <del className="text-red-800 dark:text-red-300">
                            <FieldValue row={change.before} field={field} />
                          </del>{" "}
                          <span aria-label="becomes">→</span>{" "}
                          <ins className="font-medium text-teal-800 no-underline dark:text-teal-300">
                            <FieldValue row={change.after} field={field} />
                          </ins>
                        </dd>
                      </div>
                    ))}
                </dl>
              </li>
            ))}
          </ul>
        )}
        <More shown={preview.changes.length} total={changeCount} />
      </section>

      <section aria-labelledby="preview-errors" data-testid="preview-errors">
        <h3 id="preview-errors" className="mb-1 text-sm font-semibold">
          <span aria-hidden>✕</span> Rows rejected ({errorCount.toLocaleString("en")})
        </h3>
        {errorCount === 0 ? (
          <p className="muted text-sm">None.</p>
        ) : (
          <>
            <p className="muted mb-1 text-xs">
              Rejected rows are left out; fix them in the file and import it again.
            </p>
            <TableScroll label="Rows rejected">
              <table className="w-full text-sm tabular">
                <thead className="muted text-left text-xs">
                  <tr>
                    <th className="px-2 py-1 font-medium whitespace-nowrap">File line</th>
                    <th className="px-2 py-1 font-medium">Column</th>
                    <th className="px-2 py-1 font-medium">Reason</th>
                  </tr>
                </thead>
                <tbody className="divide-line">
                  {preview.errors.map((error, index) => (
                    <tr key={`${error.line}-${error.field}-${index}`}>
                      <td className="px-2 py-1 whitespace-nowrap">line {error.line}</td>
                      <td className="px-2 py-1">
                        {error.field}
                        {error.column ? (
                          <span className="muted"> (column {error.column})</span>
                        ) : null}
                      </td>
                      <td className="px-2 py-1">{error.message}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </TableScroll>
          </>
        )}
        <More shown={preview.errors.length} total={errorCount} />
      </section>
    </div>
  );
}
