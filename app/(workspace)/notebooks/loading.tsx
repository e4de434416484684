// Shown while a notebook page loads (the list, an instrument's history, an upload or a calibration).
export default function NotebooksLoading() {
  return (
    <p role="status" className="muted text-sm">
      Loading the notebook…
    </p>
  );
}
