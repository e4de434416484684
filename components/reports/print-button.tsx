"use client";
// Opens the browser's print dialog for the printable report (A4; the navigation is not printed).
export function PrintButton() {
  return (
    <button
      type="button"
      onClick={() => window.print()}
      className="inline-flex items-center justify-center gap-2 rounded bg-ember-600 px-3 py-1.5 text-sm font-medium text-white hover:bg-ember-700"
    >
      Print
    </button>
  );
}
