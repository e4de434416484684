// The answer for anything that does not exist, or that belongs to another team.
import Link from "next/link";

export default function NotFound() {
  return (
    <main className="mx-auto max-w-md p-10 text-center">
      <h1 className="text-xl font-semibold">Not found</h1>
      <p className="muted mt-2">
        This page does not exist, or it belongs to a team you are not in.
      </p>
      <Link href="/" className="mt-4 inline-block text-ember-600 underline">
        Back to your home page
      </Link>
    </main>
  );
}
