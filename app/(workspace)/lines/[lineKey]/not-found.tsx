// Shown for a line that does not exist or belongs to another team.
import Link from "next/link";

export default function LineNotFound() {
  return (
    <div className="panel max-w-lg p-5">
      <h1 className="text-lg font-semibold">Not found</h1>
      <p className="muted mt-1 text-sm">There is no such line in your team&apos;s table.</p>
      <Link href="/lines" className="mt-3 inline-block text-sm underline">
        Back to the line library
      </Link>
    </div>
  );
}
