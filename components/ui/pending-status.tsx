"use client";
// What a long step is doing while it runs (an analysis, a re-run): a spinner, a sentence and, once the
// wait is noticeable, the seconds so far, in an `aria-live` region so a screen reader hears it too.
import { useEffect, useState } from "react";

export function PendingStatus({
  pending,
  text,
  testId,
}: {
  pending: boolean;
  /** What is happening, as a sentence. */
  text: string;
  testId?: string;
}) {
  const [seconds, setSeconds] = useState(0);
  useEffect(() => {
    if (!pending) return;
    const started = Date.now();
    const timer = setInterval(() => setSeconds(Math.floor((Date.now() - started) / 1000)), 1000);
    // Reset when the step ends, so the next one counts from zero.
    return () => {
      clearInterval(timer);
      setSeconds(0);
    };
  }, [pending]);
  return (
    <p role="status" aria-live="polite" className="text-sm" data-testid={testId}>
      {pending ? (
        <span className="flex items-center gap-2">
          <span
            aria-hidden
            className="inline-block h-3 w-3 animate-spin rounded-full border-2 border-ember-600 border-t-transparent"
          />
          <span>
            {text}
            {seconds >= 2 ? ` ${seconds} s so far.` : ""}
          </span>
        </span>
      ) : null}
    </p>
  );
}
