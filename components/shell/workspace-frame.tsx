"use client";
// The workspace's frame: a sidebar from the `sidebar` breakpoint (900 px) up, and below it a top bar
// whose "Menu" button opens the same sidebar as a sheet (Escape, the button again, the backdrop or
// following a link close it; focus goes back to the button).
import { usePathname } from "next/navigation";
import { useCallback, useEffect, useId, useRef, useState, type ReactNode } from "react";

export function WorkspaceFrame({
  brand,
  sidebar,
  children,
}: {
  /** The product's name, shown at the top of the sidebar and in the top bar. */
  brand: ReactNode;
  /** Team switcher, areas, the person and sign-out. */
  sidebar: ReactNode;
  children: ReactNode;
}) {
  const pathname = usePathname();
  // The page the sheet was opened on: following a link lands on another page, and the sheet must not
  // stay over it, so it counts as open only on the page where it was opened.
  const [openOn, setOpenOn] = useState<string | null>(null);
  const open = openOn === pathname;
  const buttonRef = useRef<HTMLButtonElement>(null);
  const menuId = useId();

  const close = useCallback((returnFocus: boolean) => {
    setOpenOn(null);
    if (returnFocus) buttonRef.current?.focus();
  }, []);

  // Escape closes from anywhere while the sheet is open, not only from inside it.
  useEffect(() => {
    if (!open) return;
    const onKey = (event: KeyboardEvent) => {
      if (event.key === "Escape") {
        event.preventDefault();
        close(true);
      }
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, [open, close]);

  return (
    <div className="flex min-h-screen flex-col sidebar:flex-row">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-[var(--panel)] focus:px-3 focus:py-2"
      >
        Skip to content
      </a>
      <header className="sticky top-0 z-30 flex h-14 items-center justify-between gap-3 border-b border-[var(--line)] bg-[var(--panel)] px-3 sidebar:hidden">
        <div className="text-lg font-semibold tracking-tight">{brand}</div>
        <button
          ref={buttonRef}
          type="button"
          aria-expanded={open}
          aria-controls={menuId}
          onClick={() => setOpenOn(open ? null : pathname)}
          className="flex min-h-10 min-w-10 items-center gap-2 rounded border border-[var(--line)] px-3 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
        >
          <span aria-hidden className="font-mono text-base leading-none">
            {open ? "×" : "≡"}
          </span>
          Menu
        </button>
      </header>
      {open ? (
        // The backdrop is for pointers only: keyboards close with Escape or the button.
        <div
          aria-hidden
          data-testid="menu-backdrop"
          className="fixed inset-x-0 bottom-0 top-14 z-30 bg-ink-950/40 sidebar:hidden"
          onClick={() => close(false)}
        />
      ) : null}
      <aside
        id={menuId}
        data-open={open}
        className={`${open ? "flex" : "hidden"} fixed bottom-0 left-0 top-14 z-40 w-full flex-col gap-5 overflow-y-auto border-r border-[var(--line)] bg-[var(--panel)] p-3 sm:w-80 sidebar:static sidebar:z-auto sidebar:flex sidebar:w-64 sidebar:shrink-0 sidebar:overflow-visible`}
      >
        <div className="hidden text-lg font-semibold tracking-tight sidebar:block">{brand}</div>
        {sidebar}
      </aside>
      {/* `isolate` keeps the charts' own stacking (Plotly's modebar) below the top bar and the sheet. */}
      <main id="main" className="isolate min-w-0 flex-1 p-3 sm:p-4 sidebar:p-6">
        {children}
      </main>
    </div>
  );
}
