"use client";
// What a segment's error boundary shows: that the page failed, what was not changed, and a retry.
export function PageError({ reset, unchanged }: { reset: () => void; unchanged: string }) {
  return (
    <div role="alert" className="panel max-w-lg p-5">
      <h1 className="text-lg font-semibold">This page could not be shown</h1>
      <p className="muted mt-1 text-sm">Something went wrong on the server. {unchanged}</p>
      <button type="button" onClick={reset} className="mt-3 rounded bg-ember-600 px-3 py-1.5 text-sm text-white">
        Try again
      </button>
    </div>
  );
}
