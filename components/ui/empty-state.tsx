// What an area shows before it has anything in it: what it is for and what to do next.
import type { ReactNode } from "react";

export function EmptyState({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="panel flex flex-col items-start gap-2 p-6">
      <h2 className="text-lg font-semibold">{title}</h2>
      <div className="muted max-w-prose text-sm">{children}</div>
    </div>
  );
}
