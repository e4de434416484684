// How the line library writes a line's values: flags as words, verification as a text mark, numbers
// in fixed columns, and a dash where the table does not know a value.
import type { LineFlag } from "@/lib/lines";
import type { SourceKind } from "@/lib/spectrum/types";

export const FLAG_LABELS: Record<LineFlag, string> = {
  persistent: "persistent",
  lamp: "lamp",
  "band-head": "band head",
  resonance: "resonance",
  blend: "blend",
};

export const SOURCE_LABELS: Record<SourceKind, string> = {
  flame: "Flame",
  arc: "Arc",
  spark: "Spark",
  plasma: "Plasma",
  lamp: "Lamp",
};

/**
 * A number as the table gave it, or an en dash for "not known". Computed values (a vacuum wavelength
 * converted from air) carry float noise: at most `decimals` places are shown, trailing zeros dropped.
 */
export function Value({
  value,
  exponent = false,
  decimals = 6,
}: {
  value: number | null | undefined;
  exponent?: boolean;
  decimals?: number;
}) {
  if (value === null || value === undefined) {
    return (
      <span className="muted" aria-label="not known">
        –
      </span>
    );
  }
  return <>{exponent ? value.toExponential(2) : String(Number(value.toFixed(decimals)))}</>;
}

export function Flags({ flags }: { flags: LineFlag[] }) {
  if (flags.length === 0) return <span className="muted">–</span>;
  return (
    <span className="flex gap-1">
      {flags.map((flag) => (
        <span
          key={flag}
          className="rounded border border-[var(--line)] px-1 text-2xs leading-4 whitespace-nowrap"
        >
          {FLAG_LABELS[flag]}
        </span>
      ))}
    </span>
  );
}

/** A check mark with the word, so that the state is never told by a symbol or colour alone. */
export function VerifiedMark({ verified }: { verified: boolean }) {
  return verified ? (
    <span className="text-teal-800 dark:text-teal-300">✓ verified</span>
  ) : (
    <span className="muted">unverified</span>
  );
}

export function RetiredMark() {
  return (
    <span className="rounded border border-red-700 px-1 text-2xs text-red-700 dark:text-red-300">
      retired
    </span>
  );
}

/** "Release 3" or "Draft". */
export function releaseLabel(release: {
  number: number | null;
  status: "draft" | "published";
}): string {
  return release.status === "draft" || release.number === null
    ? "Draft"
    : `Release ${release.number}`;
}
