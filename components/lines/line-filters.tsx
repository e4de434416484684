// The GET form above a line table: release, species, element, wavelength range, kind of source, flag
// and verification. Everything lands in the URL, so a filtered table can be shared as a link.
import Link from "next/link";
import { LINE_FLAGS } from "@/lib/lines";
import type { ReleaseSummary } from "@/lib/services/line-library-types";
import { SOURCE_KINDS, type SourceKind } from "@/lib/spectrum/types";
import type { LineSearch } from "@/lib/validation/line-forms";
import { FLAG_LABELS, releaseLabel, SOURCE_LABELS } from "./line-values";

const inputClass = "rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1 text-sm";

function Labelled({
  id,
  label,
  children,
}: {
  id: string;
  label: string;
  children: React.ReactNode;
}) {
  return (
    <div className="flex flex-col gap-0.5">
      <label htmlFor={id} className="text-xs font-medium">
        {label}
      </label>
      {children}
    </div>
  );
}

export function LineFilters({
  path,
  search,
  releases,
  releaseId,
  source,
}: {
  path: string;
  search: LineSearch;
  /** Releases to pick from; omitted where the page shows one release only (the draft). */
  releases?: ReleaseSummary[];
  releaseId?: string;
  /** The kind of source whose intensity the table shows. */
  source: SourceKind;
}) {
  return (
    <form
      method="get"
      action={path}
      role="search"
      aria-label="Filter lines"
      className="panel mb-3 flex flex-wrap items-end gap-3 p-3"
    >
      {releases ? (
        <Labelled id="release" label="Release">
          <select id="release" name="release" defaultValue={releaseId} className={inputClass}>
            {releases.map((r) => (
              <option key={r.id} value={r.id}>
                {releaseLabel(r)}
                {r.publishedAt ? ` · ${r.publishedAt.slice(0, 10)}` : " · not yet published"} ·{" "}
                {r.lineCount.toLocaleString("en")} lines
              </option>
            ))}
          </select>
        </Labelled>
      ) : null}
      <Labelled id="species" label="Species">
        <input
          id="species"
          name="species"
          defaultValue={search.species}
          placeholder="Na I"
          className={`${inputClass} w-24`}
        />
      </Labelled>
      <Labelled id="element" label="Element">
        <input
          id="element"
          name="element"
          defaultValue={search.element}
          placeholder="Na"
          className={`${inputClass} w-20`}
        />
      </Labelled>
      <fieldset className="flex items-end gap-1">
        <legend className="text-xs font-medium">Wavelength, nm</legend>
        <label htmlFor="minNm" className="sr-only">
          From nm
        </label>
        <input
          id="minNm"
          name="minNm"
          type="number"
          step="any"
          min="0"
          defaultValue={search.minNm}
          placeholder="from"
          className={`${inputClass} w-24`}
        />
        <span className="muted pb-1" aria-hidden>
          –
        </span>
        <label htmlFor="maxNm" className="sr-only">
          To nm
        </label>
        <input
          id="maxNm"
          name="maxNm"
          type="number"
          step="any"
          min="0"
          defaultValue={search.maxNm}
          placeholder="to"
          className={`${inputClass} w-24`}
        />
      </fieldset>
      <Labelled id="source" label="Kind of source">
        <select id="source" name="source" defaultValue={search.source ?? ""} className={inputClass}>
          <option value="">Any (intensity: {SOURCE_LABELS[source].toLowerCase()})</option>
          {SOURCE_KINDS.map((kind) => (
            <option key={kind} value={kind}>
              {SOURCE_LABELS[kind]}
            </option>
          ))}
        </select>
      </Labelled>
      <Labelled id="flag" label="Flag">
        <select id="flag" name="flag" defaultValue={search.flag ?? ""} className={inputClass}>
          <option value="">Any</option>
          {LINE_FLAGS.map((flag) => (
            <option key={flag} value={flag}>
              {FLAG_LABELS[flag]}
            </option>
          ))}
        </select>
      </Labelled>
      <Labelled id="verified" label="Checked">
        <select
          id="verified"
          name="verified"
          defaultValue={search.verified ?? ""}
          className={inputClass}
        >
          <option value="">Either</option>
          <option value="yes">Verified</option>
          <option value="no">Unverified</option>
        </select>
      </Labelled>
      {search.sort ? <input type="hidden" name="sort" value={search.sort} /> : null}
      {search.dir ? <input type="hidden" name="dir" value={search.dir} /> : null}
      <div className="flex items-center gap-2">
        <button
          type="submit"
          className="rounded bg-ember-600 px-3 py-1 text-sm font-medium text-white hover:bg-ember-700"
        >
          Show lines
        </button>
        <Link
          href={releaseId && releases ? `${path}?release=${releaseId}` : path}
          className="text-sm underline"
        >
          Clear
        </Link>
      </div>
    </form>
  );
}
