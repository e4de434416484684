// Shown while an instruments page loads (the list, an instrument's history, an upload or a calibration).
export default function InstrumentsLoading() {
  return (
    <p role="status" className="muted text-sm">
      Loading instruments…
    </p>
  );
}
