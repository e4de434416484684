// Page links under a line table: which rows are shown, previous/next and a window of page numbers.
import Link from "next/link";
import { lineSearchHref, type LineSearch } from "@/lib/validation/line-forms";

export function LinePagination({
  path,
  search,
  page,
  pageSize,
  total,
}: {
  path: string;
  search: LineSearch;
  page: number;
  pageSize: number;
  total: number;
}) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);
  const windowStart = Math.max(1, Math.min(page - 3, pages - 6));
  const numbers = Array.from({ length: Math.min(7, pages) }, (_, i) => windowStart + i);
  const href = (p: number) => lineSearchHref(path, search, { page: p === 1 ? undefined : p });
  const linkClass =
    "rounded border border-[var(--line)] px-2 py-0.5 hover:bg-ink-100 dark:hover:bg-ink-800";
  return (
    <nav
      aria-label="Pages"
      className="mt-3 flex flex-wrap items-center justify-between gap-3 text-sm"
    >
      <p className="muted" role="status">
        Rows {first.toLocaleString("en")}–{last.toLocaleString("en")} of{" "}
        {total.toLocaleString("en")}
      </p>
      {pages > 1 ? (
        <ul className="flex flex-wrap items-center gap-1">
          {page > 1 ? (
            <li>
              <Link href={href(page - 1)} className={linkClass} rel="prev">
                ← Previous
              </Link>
            </li>
          ) : null}
          {numbers[0] > 1 ? (
            <li>
              <Link href={href(1)} className={linkClass}>
                1
              </Link>
              <span className="muted px-1">…</span>
            </li>
          ) : null}
          {numbers.map((p) => (
            <li key={p}>
              {p === page ? (
                <span
                  aria-current="page"
                  className="rounded border border-ember-600 px-2 py-0.5 font-semibold"
                >
                  {p}
                </span>
              ) : (
                <Link href={href(p)} className={linkClass} aria-label={`Page ${p}`}>
                  {p}
                </Link>
              )}
            </li>
          ))}
          {numbers[numbers.length - 1] < pages ? (
            <li>
              <span className="muted px-1">…</span>
              <Link href={href(pages)} className={linkClass} aria-label={`Page ${pages}, the last`}>
                {pages}
              </Link>
            </li>
          ) : null}
          {page < pages ? (
            <li>
              <Link href={href(page + 1)} className={linkClass} rel="next">
                Next →
              </Link>
            </li>
          ) : null}
        </ul>
      ) : null}
    </nav>
  );
}
