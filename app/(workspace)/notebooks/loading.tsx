// Shown while a notebooks page loads: the shape of the list to come, announced as loading.
export default function NotebooksLoading() {
  return (
    <div role="status" aria-busy="true" className="flex flex-col gap-3">
      <span className="sr-only">Loading the notebook…</span>
      <span className="block h-7 w-72 animate-pulse rounded bg-ink-100 dark:bg-ink-800" />
      <span className="block h-4 w-48 animate-pulse rounded bg-ink-100 dark:bg-ink-800" />
      <div className="panel flex flex-col gap-2 p-3">
        {[0, 1, 2, 3].map((i) => (
          <span
            key={i}
            className="block h-4 w-full animate-pulse rounded bg-ink-100 dark:bg-ink-800"
          />
        ))}
      </div>
    </div>
  );
}
