// Shown while a workspace page loads.
export default function Loading() {
  return (
    <p role="status" className="muted text-sm">
      Loading…
    </p>
  );
}
