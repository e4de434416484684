// Shown while a run page loads (the list, an instrument's history, an upload or a calibration).
export default function RunLoading() {
  return (
    <p role="status" className="muted text-sm">
      Loading the run…
    </p>
  );
}
