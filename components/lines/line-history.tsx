// A line's history from the audit trail: who did what, when, in which release, why, and what changed.
import type { LineHistoryEntry } from "@/lib/services/line-library-types";

const ACTION_LABELS: Record<string, string> = {
  "line.add": "added",
  "line.update": "corrected",
  "line.retire": "retired",
  "line.restore": "restored",
  "line.verify": "marked verified",
};

/** A reference check's decision for this line, in words. */
const REFERENCE_DECISIONS: Record<string, string> = {
  verified: "verified against a reference",
  take: "took the reference value and verified",
  keep: "kept our value against a reference",
};

// Audit payloads carry bookkeeping next to the line's values; these are not changes of the line.
const BOOKKEEPING = new Set([
  "releaseId",
  "fields",
  "import",
  "element",
  "ionStage",
  "lineKey",
  "id",
  "version",
  "decision",
]);

function show(value: unknown): string {
  if (value === null || value === undefined || value === "") return "–";
  if (Array.isArray(value)) return value.length ? value.join(", ") : "–";
  if (typeof value === "object") {
    const entries = Object.entries(value as Record<string, unknown>);
    return entries.length ? entries.map(([k, v]) => `${k} ${show(v)}`).join(", ") : "–";
  }
  return String(value);
}

/** The fields an event changed, with their values before and after. */
function changesOf(entry: LineHistoryEntry): { field: string; before: string; after: string }[] {
  const before = (entry.before && typeof entry.before === "object" ? entry.before : {}) as Record<
    string,
    unknown
  >;
  const after = (entry.after && typeof entry.after === "object" ? entry.after : {}) as Record<
    string,
    unknown
  >;
  const named = Array.isArray(after.fields) ? (after.fields as string[]) : null;
  const keys = named ?? [...new Set([...Object.keys(before), ...Object.keys(after)])];
  return keys
    .filter((key) => !BOOKKEEPING.has(key))
    .flatMap((field) => {
      // Intensities are one field per kind of source for a reader, not one blob.
      if (field === "intensities") {
        const was = (before.intensities ?? {}) as Record<string, unknown>;
        const now = (after.intensities ?? {}) as Record<string, unknown>;
        return [...new Set([...Object.keys(was), ...Object.keys(now)])].map((kind) => ({
          field: `intensity, ${kind}`,
          before: show(was[kind]),
          after: show(now[kind]),
        }));
      }
      return [{ field, before: show(before[field]), after: show(after[field]) }];
    })
    .filter((c) => c.before !== c.after);
}

function actionLabel(entry: LineHistoryEntry): string {
  if (entry.action === "line_release.reference_check") {
    const decision = (entry.after as { decision?: string } | null)?.decision ?? "";
    return REFERENCE_DECISIONS[decision] ?? "checked against a reference";
  }
  return ACTION_LABELS[entry.action] ?? entry.action;
}

function isImport(entry: LineHistoryEntry): boolean {
  return Boolean(
    entry.after && typeof entry.after === "object" && (entry.after as { import?: unknown }).import,
  );
}

export function LineHistory({ entries }: { entries: LineHistoryEntry[] }) {
  if (entries.length === 0)
    return (
      <p className="muted text-sm">
        No change of this line is recorded; it came with the starter table.
      </p>
    );
  return (
    <ol className="divide-line text-sm" data-testid="line-history">
      {entries.map((entry, index) => {
        const changes = changesOf(entry);
        const isAdd = entry.action.endsWith("add");
        return (
          <li key={`${entry.at}-${index}`} className="py-2">
            <p>
              <span className="font-medium">
                {actionLabel(entry)}
                {isImport(entry) ? " by CSV import" : ""}
              </span>{" "}
              by {entry.actorName ?? "the system"}{" "}
              <time dateTime={entry.at} className="muted">
                {entry.at.slice(0, 16).replace("T", " ")} UTC
              </time>
              {entry.releaseNumber !== null ? (
                <span className="muted"> · release {entry.releaseNumber}</span>
              ) : (
                <span className="muted"> · draft</span>
              )}
            </p>
            {entry.reason ? <p className="mt-0.5">Why: {entry.reason}</p> : null}
            {changes.length > 0 && !isAdd ? (
              <dl className="mt-1 grid grid-cols-[9rem_1fr] gap-x-3 text-xs tabular">
                {changes.map((c) => (
                  <div key={c.field} className="contents">
                    <dt className="muted">{c.field}</dt>
                    <dd>
                      <del className="text-red-800 dark:text-red-300">{c.before}</del>{" "}
                      <span aria-label="becomes">→</span>{" "}
                      <ins className="font-medium text-teal-800 no-underline dark:text-teal-300">
                        {c.after}
                      </ins>
                    </dd>
                  </div>
                ))}
              </dl>
            ) : null}
          </li>
        );
      })}
    </ol>
  );
}
