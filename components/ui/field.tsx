// A labelled input whose errors sit in an aria-live region the input points at.
import type { InputHTMLAttributes, ReactNode } from "react";

export function Field({
  label,
  name,
  errors,
  hint,
  ...input
}: InputHTMLAttributes<HTMLInputElement> & {
  label: ReactNode;
  name: string;
  errors?: string[];
  hint?: string;
}) {
  const errorId = `${name}-error`;
  const hintId = hint ? `${name}-hint` : undefined;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={input.id ?? name} className="text-sm font-medium">
        {label}
      </label>
      <input
        id={input.id ?? name}
        name={name}
        aria-describedby={[errorId, hintId].filter(Boolean).join(" ")}
        aria-invalid={errors?.length ? true : undefined}
        className="rounded border border-[var(--line)] bg-[var(--panel)] px-2 py-1.5 text-base aria-[invalid=true]:border-red-600"
        {...input}
      />
      {hint ? (
        <p id={hintId} className="muted text-xs">
          {hint}
        </p>
      ) : null}
      <div id={errorId} aria-live="polite" className="text-xs text-red-700 dark:text-red-300">
        {errors?.map((message) => (
          <p key={message}>{message}</p>
        ))}
      </div>
    </div>
  );
}
