// A run's status as a word with a shape beside it, so the state is never told by colour alone.
import type { RunStatus } from "@/lib/runs/types";

export const RUN_STATUS_LABELS: Record<RunStatus, string> = {
  draft: "Draft",
  submitted: "Submitted",
  returned: "Returned",
  signed: "Signed",
};

const SHAPES: Record<RunStatus, string> = {
  draft: "○",
  submitted: "◐",
  returned: "↩",
  signed: "●",
};
const TONES: Record<RunStatus, string> = {
  draft: "text-ink-700 dark:text-ink-200",
  submitted: "text-sky-800 dark:text-sky-300",
  returned: "text-ember-800 dark:text-ember-200",
  signed: "text-teal-800 dark:text-teal-300",
};

export function RunStatusBadge({ status }: { status: RunStatus }) {
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap ${TONES[status]}`}
      data-status={status}
    >
      <span aria-hidden>{SHAPES[status]}</span>
      {RUN_STATUS_LABELS[status]}
    </span>
  );
}
