// The lab lead's way into the draft: continue the open one, or open a new one from the newest release.
import Link from "next/link";

export function DraftEntry({
  draft,
  teamId,
  openAction,
}: {
  draft: { id: string; lineCount: number } | undefined;
  teamId: string;
  openAction: (formData: FormData) => Promise<void>;
}) {
  if (draft) {
    return (
      <Link
        href="/lines/draft"
        className="rounded bg-ember-600 px-3 py-1.5 text-sm font-medium text-white hover:bg-ember-700"
      >
        Continue the draft
      </Link>
    );
  }
  return (
    <form action={openAction}>
      <input type="hidden" name="teamId" value={teamId} />
      <button
        type="submit"
        className="rounded bg-ember-600 px-3 py-1.5 text-sm font-medium text-white hover:bg-ember-700"
      >
        Open the draft
      </button>
    </form>
  );
}
