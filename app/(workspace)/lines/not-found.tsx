// Shown for a line-library page the person may not open (the draft, for anyone but a lab lead).
import Link from "next/link";

export default function LinesNotFound() {
  return (
    <div className="panel max-w-lg p-5">
      <h1 className="text-lg font-semibold">Not found</h1>
      <p className="muted mt-1 text-sm">
        This part of the line library does not exist, or is only for the team&apos;s lab leads.
      </p>
      <Link href="/lines" className="mt-3 inline-block text-sm underline">
        Back to the line library
      </Link>
    </div>
  );
}
