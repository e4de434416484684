// Shown while a page of the line library loads (a release's table, the draft, a comparison).
export default function LinesLoading() {
  return (
    <p role="status" className="muted text-sm">
      Loading the line table…
    </p>
  );
}
