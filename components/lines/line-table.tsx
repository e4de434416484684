// The dense table of lines: sortable by wavelength, species and intensity through links that keep
// the rest of the search, one row per line with its values, flags, source and verification.
import Link from "next/link";
import type { ReactNode } from "react";
import type { LineRecord, LineSortKey } from "@/lib/services/line-library-types";
import type { SourceKind } from "@/lib/spectrum/types";
import { lineSearchHref, type LineSearch } from "@/lib/validation/line-forms";
import { Flags, RetiredMark, SOURCE_LABELS, Value, VerifiedMark } from "./line-values";
import { TableScroll } from "@/components/ui/table-scroll";

export interface LineTableProps {
  lines: LineRecord[];
  search: LineSearch;
  /** The page the sort links point at ("/lines", "/lines/draft"). */
  path: string;
  /** The kind of source whose intensity the intensity column shows. */
  source: SourceKind;
  /** Where a species links to; omitted for no link. */
  lineHref?: (line: LineRecord) => string;
  /** A last column of per-row actions (the draft). */
  rowActions?: (line: LineRecord) => ReactNode;
  caption: string;
}

function SortHeader({
  label,
  sortKey,
  search,
  path,
  className = "",
}: {
  label: ReactNode;
  sortKey: LineSortKey;
  search: LineSearch;
  path: string;
  className?: string;
}) {
  const current = (search.sort ?? "wavelength") === sortKey;
  const direction = search.dir ?? (search.sort === "intensity" ? "desc" : "asc");
  const next = current
    ? direction === "asc"
      ? "desc"
      : "asc"
    : sortKey === "intensity"
      ? "desc"
      : "asc";
  return (
    <th
      scope="col"
      aria-sort={current ? (direction === "asc" ? "ascending" : "descending") : undefined}
      className={`px-2 py-1.5 font-medium ${className}`}
    >
      <Link
        href={lineSearchHref(path, search, { sort: sortKey, dir: next, page: undefined })}
        className="inline-flex items-center gap-1 hover:underline"
      >
        {label}
        <span aria-hidden className={current ? "text-ember-600" : "muted"}>
          {current ? (direction === "asc" ? "▲" : "▼") : "↕"}
        </span>
        <span className="sr-only">
          {current ? `sorted ${direction === "asc" ? "ascending" : "descending"}` : "sort"}
        </span>
      </Link>
    </th>
  );
}

export function LineTable({
  lines,
  search,
  path,
  source,
  lineHref,
  rowActions,
  caption,
}: LineTableProps) {
  return (
    <TableScroll label={caption} className="panel">
      <table className="w-full text-sm tabular" data-testid="line-table">
        <caption className="sr-only">{caption}</caption>
        <thead className="muted border-b border-[var(--line)] text-left text-xs">
          <tr>
            <SortHeader label="Species" sortKey="species" search={search} path={path} />
            <SortHeader
              label="Air nm"
              sortKey="wavelength"
              search={search}
              path={path}
              className="text-right"
            />
            <th scope="col" className="px-2 py-1.5 text-right font-medium">
              Vacuum nm
            </th>
            <th scope="col" className="px-2 py-1.5 text-right font-medium">
              ± nm
            </th>
            <SortHeader
              label={`Intensity (${SOURCE_LABELS[source].toLowerCase()})`}
              sortKey="intensity"
              search={search}
              path={path}
              className="text-right"
            />
            <th scope="col" className="px-2 py-1.5 text-right font-medium">
              E<sub>upper</sub> eV
            </th>
            <th scope="col" className="px-2 py-1.5 text-right font-medium">
              g
            </th>
            <th scope="col" className="px-2 py-1.5 text-right font-medium">
              A s⁻¹
            </th>
            <th scope="col" className="px-2 py-1.5 font-medium">
              Flags
            </th>
            <th scope="col" className="px-2 py-1.5 font-medium">
              Source
            </th>
            <th scope="col" className="px-2 py-1.5 font-medium">
              Checked
            </th>
            {rowActions ? (
              <th scope="col" className="px-2 py-1.5 font-medium">
                <span className="sr-only">Changes</span>
              </th>
            ) : null}
          </tr>
        </thead>
        <tbody className="divide-line">
          {lines.map((line) => (
            <tr key={line.id} className={line.retired ? "align-top opacity-70" : "align-top"}>
              <th scope="row" className="px-2 py-1 text-left font-medium whitespace-nowrap">
                {lineHref ? (
                  <Link
                    href={lineHref(line)}
                    className="text-ember-700 hover:underline dark:text-ember-300"
                  >
                    {line.species}
                  </Link>
                ) : (
                  line.species
                )}{" "}
                {line.retired ? <RetiredMark /> : null}
              </th>
              <td className="px-2 py-1 text-right">
                <Value value={line.airNm} decimals={4} />
              </td>
              <td className="px-2 py-1 text-right">
                <Value value={line.vacuumNm} decimals={4} />
              </td>
              <td className="px-2 py-1 text-right">
                <Value value={line.uncertaintyNm} />
              </td>
              <td className="px-2 py-1 text-right">
                <Value value={line.intensities[source]} />
              </td>
              <td className="px-2 py-1 text-right">
                <Value value={line.upperEv} />
              </td>
              <td className="px-2 py-1 text-right">
                <Value value={line.g} />
              </td>
              <td className="px-2 py-1 text-right">
                <Value value={line.a} exponent />
              </td>
              <td className="px-2 py-1">
                <Flags flags={line.flags} />
              </td>
              <td
                className={`truncate px-2 py-1 ${rowActions ? "max-w-36" : "max-w-56"}`}
                title={line.source}
              >
                {line.source}
              </td>
              <td className="px-2 py-1">
                <span className="whitespace-nowrap">
                  <VerifiedMark verified={line.verified} />
                </span>
                {line.verifiedCitation ? (
                  <span
                    className="muted block max-w-48 truncate text-2xs"
                    title={`Against ${line.verifiedCitation}`}
                    data-testid="verified-citation"
                  >
                    against {line.verifiedCitation}
                  </span>
                ) : null}
              </td>
              {rowActions ? <td className="px-2 py-1">{rowActions(line)}</td> : null}
            </tr>
          ))}
        </tbody>
      </table>
    </TableScroll>
  );
}
