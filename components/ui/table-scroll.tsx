// The box every table sits in: a table wider than the screen scrolls inside it, never the page, and the
// box is a named, focusable region so that a keyboard can scroll it with the arrow keys.
import type { ReactNode } from "react";

export function TableScroll({
  label,
  className = "",
  children,
  testId,
}: {
  /** Names the region for screen readers ("Peaks", "Members"): what the table holds. */
  label: string;
  /** The box's look (`panel`, a height cap such as `max-h-96`); the scrolling is always on. */
  className?: string;
  children: ReactNode;
  testId?: string;
}) {
  return (
    <div
      role="region"
      aria-label={label}
      // Focusable, so that keyboard users can reach the scrollbar: a table of text has nothing else to focus.
      // `relative` holds screen-reader-only text (absolutely placed) inside the box, not beyond the page;
      // a visible caption keeps to the box's width and stays in view while the table scrolls sideways.
      tabIndex={0}
      data-testid={testId}
      className={`@container relative max-w-full overflow-x-auto [&>table>caption]:sticky [&>table>caption]:left-0 [&>table>caption]:max-w-[100cqw] ${className}`}
    >
      {children}
    </div>
  );
}
