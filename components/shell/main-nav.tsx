"use client";
// The workspace navigation; the current area is marked for sight and for screen readers, and an area
// with things waiting (the review queue) shows how many.
import Link from "next/link";
import { usePathname } from "next/navigation";

export interface NavItem {
  href: string;
  label: string;
  /** Things waiting in the area; shown when above zero. */
  count?: number;
  /** What the count means, for screen readers ("waiting for you"). */
  countLabel?: string;
}

export function MainNav({ items }: { items: NavItem[] }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Areas" className="flex flex-col gap-0.5">
      {items.map((item) => {
        const active = item.href === "/" ? pathname === "/" : pathname.startsWith(item.href);
        // The count sits beside the link, not in it, so the link's name stays the area's name.
        return (
          <div key={item.href} className="relative">
            <Link
              href={item.href}
              aria-current={active ? "page" : undefined}
              className={`block min-h-10 rounded px-2 py-2.5 text-sm sidebar:min-h-0 sidebar:py-1.5 ${
                active
                  ? "border-l-2 border-ember-600 bg-ember-50 font-medium text-ember-800 dark:bg-ink-800 dark:text-ember-200"
                  : "border-l-2 border-transparent hover:bg-ink-100 dark:hover:bg-ink-800"
              }`}
            >
              {item.label}
            </Link>
            {item.count ? (
              <span
                className="pointer-events-none absolute right-2 top-1/2 -translate-y-1/2 rounded-full bg-ember-600 px-1.5 text-xs font-semibold text-white"
                data-testid={`nav-count-${item.href.slice(1)}`}
              >
                {item.count}
                <span className="sr-only"> {item.countLabel ?? "waiting"}</span>
              </span>
            ) : null}
          </div>
        );
      })}
    </nav>
  );
}
