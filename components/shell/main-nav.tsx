"use client";
// The workspace navigation; the current area is marked for sight and for screen readers.
import Link from "next/link";
import { usePathname } from "next/navigation";

export interface NavItem {
  href: string;
  label: string;
}

export function MainNav({ items }: { items: NavItem[] }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Areas" className="flex flex-col gap-0.5">
      {items.map((item) => {
        const active = item.href === "/" ? pathname === "/" : pathname.startsWith(item.href);
        return (
          <Link
            key={item.href}
            href={item.href}
            aria-current={active ? "page" : undefined}
            className={`rounded px-2 py-1.5 text-sm ${
              active
                ? "border-l-2 border-ember-600 bg-ember-50 font-medium text-ember-800 dark:bg-ink-800 dark:text-ember-200"
                : "border-l-2 border-transparent hover:bg-ink-100 dark:hover:bg-ink-800"
            }`}
          >
            {item.label}
          </Link>
        );
      })}
    </nav>
  );
}
