// Placeholder rows while a list loads: grey bars of the table's shape, announced once as loading.
export function SkeletonRows({
  rows = 3,
  columns,
  label,
}: {
  rows?: number;
  columns: number;
  label: string;
}) {
  return (
    <tbody aria-busy="true" data-testid="skeleton">
      {Array.from({ length: rows }, (_, r) => (
        <tr key={r} className="border-b border-[var(--line)] last:border-0">
          {Array.from({ length: columns }, (_, c) => (
            <td key={c} className="px-3 py-2">
              <span className="block h-4 w-full max-w-32 animate-pulse rounded bg-ink-100 dark:bg-ink-800" />
              {r === 0 && c === 0 ? <span className="sr-only">{label}</span> : null}
            </td>
          ))}
        </tr>
      ))}
    </tbody>
  );
}
