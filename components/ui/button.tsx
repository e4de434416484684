// Buttons: one primary (the warm accent) and one quiet style; the pending state is announced.
import type { ButtonHTMLAttributes } from "react";

type Variant = "primary" | "quiet" | "danger";

const STYLES: Record<Variant, string> = {
  primary: "bg-ember-600 text-white hover:bg-ember-700 disabled:bg-ember-300",
  quiet: "border border-[var(--line)] bg-[var(--panel)] hover:bg-ink-100 dark:hover:bg-ink-800",
  danger:
    "border border-red-700 text-red-700 hover:bg-red-50 dark:text-red-300 dark:hover:bg-red-950",
};

export function Button({
  variant = "primary",
  pending = false,
  className = "",
  children,
  ...props
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant; pending?: boolean }) {
  return (
    <button
      {...props}
      disabled={props.disabled || pending}
      aria-busy={pending || undefined}
      className={`inline-flex items-center justify-center gap-2 rounded px-3 py-1.5 text-sm font-medium transition-colors disabled:cursor-not-allowed ${STYLES[variant]} ${className}`}
    >
      {children}
    </button>
  );
}
