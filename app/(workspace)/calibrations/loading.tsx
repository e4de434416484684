// Shown while a calibration page loads (the list, an instrument's history, an upload or a calibration).
export default function CalibrationLoading() {
  return (
    <p role="status" className="muted text-sm">
      Loading the calibration…
    </p>
  );
}
