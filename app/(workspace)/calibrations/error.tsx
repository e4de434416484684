"use client";
// Shown when a calibration page fails: nothing was saved.
export default function CalibrationError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div role="alert" className="panel max-w-lg p-5">
      <h1 className="text-lg font-semibold">This page could not be shown</h1>
      <p className="muted mt-1 text-sm">Something went wrong on the server. Nothing was saved.</p>
      <button type="button" onClick={reset} className="mt-3 rounded bg-ember-600 px-3 py-1.5 text-sm text-white">
        Try again
      </button>
    </div>
  );
}
