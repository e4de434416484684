"use client";
// A modal question before a destructive step: the browser's own <dialog> keeps focus inside it and
// closes on Escape; Cancel has the focus first, so Enter alone never confirms the destructive choice.
import { useEffect, useId, useRef, type ReactNode } from "react";
import { Button } from "./button";

export function ConfirmDialog({
  open,
  title,
  confirmLabel,
  pending = false,
  onConfirm,
  onCancel,
  children,
}: {
  open: boolean;
  title: string;
  confirmLabel: string;
  pending?: boolean;
  onConfirm: () => void;
  onCancel: () => void;
  children: ReactNode;
}) {
  const dialog = useRef<HTMLDialogElement>(null);
  const id = useId();

  useEffect(() => {
    const element = dialog.current;
    if (!element) return;
    if (open && !element.open) {
      element.showModal();
      element.querySelector<HTMLButtonElement>("[data-dialog-cancel]")?.focus();
    } else if (!open && element.open) {
      element.close();
    }
  }, [open]);

  return (
    <dialog
      ref={dialog}
      aria-labelledby={`${id}-title`}
      aria-describedby={`${id}-body`}
      onCancel={(event) => {
        // Escape: close through the parent's state, so it can put the focus back where it was.
        event.preventDefault();
        if (!pending) onCancel();
      }}
      className="panel m-auto max-w-md border border-[var(--line)] p-5 text-[var(--text)] backdrop:bg-black/40"
    >
      <h2 id={`${id}-title`} className="mb-2 text-lg font-semibold">
        {title}
      </h2>
      <div id={`${id}-body`} className="mb-4 flex flex-col gap-2 text-sm">
        {children}
      </div>
      <div className="flex justify-end gap-2">
        <Button
          data-dialog-cancel
          type="button"
          variant="quiet"
          onClick={onCancel}
          disabled={pending}
        >
          Cancel
        </Button>
        <Button type="button" variant="danger" onClick={onConfirm} pending={pending}>
          {confirmLabel}
        </Button>
      </div>
    </dialog>
  );
}
