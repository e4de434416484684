// Warnings of a calibration or a run, each in its own bordered box after a warning sign (the sign is
// decoration: the words say it). Nothing when there are none.

export function WarningList({
  warnings,
  alert = false,
  className = "",
}: {
  warnings: readonly { code: string; message: string }[];
  /** Announced when the page opens (a saved calibration's own page). */
  alert?: boolean;
  className?: string;
}) {
  if (warnings.length === 0) return null;
  return (
    <ul role={alert ? "alert" : undefined} className={`flex flex-col gap-1 text-sm ${className}`}>
      {warnings.map((w) => (
        <li key={w.code + w.message} className="rounded border border-ember-600 p-2">
          <span aria-hidden>⚠ </span>
          {w.message}
        </li>
      ))}
    </ul>
  );
}
