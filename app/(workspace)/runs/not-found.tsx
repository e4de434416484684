// Shown for an instrument that does not exist or belongs to another team.
import Link from "next/link";

export default function RunNotFound() {
  return (
    <div className="panel max-w-lg p-5">
      <h1 className="text-lg font-semibold">Not found</h1>
      <p className="muted mt-1 text-sm">This run does not exist in your team.</p>
      <Link href="/notebooks" className="mt-3 inline-block text-sm underline">
        Back to the notebooks
      </Link>
    </div>
  );
}
