// An event's before and after side by side, field by field; changed, added and removed fields are
// marked with a symbol and a word as well as a tint, so nothing is told by colour alone.
import {
  flattenAuditValue,
  type AuditChange,
  type AuditChangeKind,
} from "@/lib/audit/diff-audit-values";
import { fieldLabel } from "@/lib/audit/action-words";
import { formatAuditValue } from "./audit-labels";
import { TableScroll } from "@/components/ui/table-scroll";

const MARKS: Record<AuditChangeKind, { symbol: string; word: string }> = {
  changed: { symbol: "Δ", word: "changed" },
  added: { symbol: "+", word: "added" },
  removed: { symbol: "−", word: "removed" },
};

function changeOf(path: string, changes: AuditChange[]): AuditChange | undefined {
  return changes.find(
    (c) =>
      c.path === path ||
      c.path === "" ||
      path.startsWith(`${c.path}.`) ||
      path.startsWith(`${c.path}[`),
  );
}

export function BeforeAfter({
  before,
  after,
  changes,
  caption,
}: {
  before: unknown;
  after: unknown;
  changes: AuditChange[];
  caption: string;
}) {
  const beforeLeaves = new Map(flattenAuditValue(before).map((l) => [l.path, l.value]));
  const afterLeaves = new Map(flattenAuditValue(after).map((l) => [l.path, l.value]));
  const paths = [
    ...beforeLeaves.keys(),
    ...[...afterLeaves.keys()].filter((p) => !beforeLeaves.has(p)),
  ];
  if (paths.length === 0) {
    return <p className="muted text-sm">This event carries no before or after values.</p>;
  }
  const compared = before != null && after != null;
  const note =
    before == null
      ? "Nothing before: the record was created here."
      : after == null
        ? "Nothing after: the record was removed here."
        : `${changes.length} field${changes.length === 1 ? "" : "s"} changed.`;
  return (
    <TableScroll label={caption}>
      <p className="muted mb-1 text-xs">{note}</p>
      <table className="w-full text-xs" data-testid="before-after">
        <caption className="sr-only">{caption}</caption>
        <thead className="muted text-left">
          <tr>
            <th scope="col" className="px-2 py-1 font-medium">
              Field
            </th>
            <th scope="col" className="px-2 py-1 font-medium">
              Before
            </th>
            <th scope="col" className="px-2 py-1 font-medium">
              After
            </th>
            {compared ? (
              <th scope="col" className="px-2 py-1 font-medium">
                Change
              </th>
            ) : null}
          </tr>
        </thead>
        <tbody>
          {paths.map((path) => {
            const change = compared ? changeOf(path, changes) : undefined;
            const mark = change ? MARKS[change.kind] : null;
            return (
              <tr
                key={path || "(value)"}
                data-changed={mark ? change?.kind : undefined}
                className={`border-t border-[var(--line)] align-top ${mark ? "bg-ember-50 dark:bg-ink-800" : ""}`}
              >
                <th
                  scope="row"
                  className={`px-2 py-1 text-left ${mark ? "font-semibold" : "font-normal"}`}
                >
                  {fieldLabel(path)}
                  {path ? <div className="muted font-mono font-normal">{path}</div> : null}
                </th>
                <td className="max-w-[28rem] break-all px-2 py-1 font-mono">
                  {beforeLeaves.has(path) ? formatAuditValue(beforeLeaves.get(path)) : "—"}
                </td>
                <td className="max-w-[28rem] break-all px-2 py-1 font-mono">
                  {afterLeaves.has(path) ? formatAuditValue(afterLeaves.get(path)) : "—"}
                </td>
                {compared ? (
                  <td className="whitespace-nowrap px-2 py-1">
                    {mark ? (
                      <span>
                        <span
                          aria-hidden
                          className="font-semibold text-ember-700 dark:text-ember-300"
                        >
                          {mark.symbol}{" "}
                        </span>
                        {mark.word}
                      </span>
                    ) : (
                      <span className="muted">same</span>
                    )}
                  </td>
                ) : null}
              </tr>
            );
          })}
        </tbody>
      </table>
    </TableScroll>
  );
}
