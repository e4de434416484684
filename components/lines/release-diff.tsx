// The differences between two releases: added, removed and changed lines, each change field by field.
import Link from "next/link";
import type { LineRecord, ReleaseDiff } from "@/lib/services/line-library-types";
import { releaseLabel, Value } from "./line-values";

const FIELD_LABELS: Record<string, string> = {
  airNm: "air nm",
  vacuumNm: "vacuum nm",
  uncertaintyNm: "± nm",
  lowerEv: "E lower eV",
  upperEv: "E upper eV",
  gUpper: "g",
  aPerS: "A s⁻¹",
};

// ReleaseDiff names fields as the CSV row does (gUpper, aPerS); the record calls them g and a.
const RECORD_FIELD: Record<string, keyof LineRecord> = { gUpper: "g", aPerS: "a" };

function show(line: LineRecord, field: string): string {
  const value = line[(RECORD_FIELD[field] ?? field) as keyof LineRecord];
  if (value === null || value === undefined || value === "") return "–";
  if (Array.isArray(value)) return value.length ? value.join(", ") : "–";
  if (typeof value === "object") {
    const entries = Object.entries(value);
    return entries.length ? entries.map(([k, v]) => `${k} ${v}`).join(", ") : "–";
  }
  if (typeof value === "boolean") return value ? "yes" : "no";
  return String(value);
}

function LineName({ line }: { line: LineRecord }) {
  return (
    <Link
      href={`/lines/${encodeURIComponent(line.lineKey)}?line=${line.id}`}
      className="font-medium hover:underline"
    >
      {line.species} {line.airNm ?? line.vacuumNm} nm
    </Link>
  );
}

function LineList({ lines, testId }: { lines: LineRecord[]; testId: string }) {
  if (lines.length === 0) return <p className="muted text-sm">None.</p>;
  return (
    <ul className="divide-line text-sm tabular" data-testid={testId}>
      {lines.map((line) => (
        <li key={line.id} className="flex flex-wrap gap-x-3 py-1">
          <LineName line={line} />
          <span className="muted">
            vacuum <Value value={line.vacuumNm} decimals={4} /> nm
          </span>
          <span className="muted max-w-md truncate" title={line.source}>
            {line.source}
          </span>
        </li>
      ))}
    </ul>
  );
}

export function ReleaseDiffView({ diff }: { diff: ReleaseDiff }) {
  return (
    <div className="flex flex-col gap-4">
      <p className="text-sm" role="status">
        From {releaseLabel(diff.from).toLowerCase()} to {releaseLabel(diff.to).toLowerCase()}:{" "}
        <strong>{diff.added.length}</strong> added, <strong>{diff.removed.length}</strong> removed,{" "}
        <strong>{diff.changed.length}</strong> changed.
      </p>
      <section className="panel p-4" aria-labelledby="diff-added">
        <h2 id="diff-added" className="mb-1 font-semibold">
          <span aria-hidden>+</span> Added ({diff.added.length})
        </h2>
        <LineList lines={diff.added} testId="diff-added" />
      </section>
      <section className="panel p-4" aria-labelledby="diff-removed">
        <h2 id="diff-removed" className="mb-1 font-semibold">
          <span aria-hidden>−</span> Removed ({diff.removed.length})
        </h2>
        <LineList lines={diff.removed} testId="diff-removed" />
      </section>
      <section className="panel p-4" aria-labelledby="diff-changed">
        <h2 id="diff-changed" className="mb-1 font-semibold">
          <span aria-hidden>~</span> Changed ({diff.changed.length})
        </h2>
        {diff.changed.length === 0 ? (
          <p className="muted text-sm">None.</p>
        ) : (
          <ul className="divide-line text-sm" data-testid="diff-changed">
            {diff.changed.map(({ before, after, fields }) => (
              <li key={after.id} className="py-1.5">
                <LineName line={after} />
                <dl className="mt-0.5 grid grid-cols-[8rem_1fr] gap-x-3 text-xs tabular">
                  {fields.map((field) => (
                    <div key={field} className="contents">
                      <dt className="muted">{FIELD_LABELS[field] ?? field}</dt>
                      <dd>
                        <del className="text-red-800 dark:text-red-300">{show(before, field)}</del>{" "}
                        <span aria-label="becomes">→</span>{" "}
                        <ins className="font-medium text-teal-800 no-underline dark:text-teal-300">
                          {show(after, field)}
                        </ins>
                      </dd>
                    </div>
                  ))}
                </dl>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
