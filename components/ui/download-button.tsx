"use client";
// A download as a button: it fetches the file with the session cookie, says what it is preparing (the
// PDF report takes several seconds), saves it under the server's file name and says so, or says in a
// sentence why it failed. The status line is `aria-live`, so a screen reader hears each step.
import { useEffect, useId, useRef, useState } from "react";
import { failureText, fileNameFromDisposition, preparingText, readyText } from "./download-words";

type Status =
  | { state: "idle" }
  | { state: "preparing"; seconds: number }
  | { state: "ready"; fileName: string }
  | { state: "failed"; message: string };

const BUTTON =
  "inline-flex items-center gap-2 rounded border border-[var(--line)] bg-[var(--panel)] px-3 py-1.5 text-sm hover:bg-ink-100 disabled:cursor-progress disabled:opacity-80 dark:hover:bg-ink-800";

async function reasonOf(response: Response): Promise<string | null> {
  try {
    const body = (await response.json()) as { error?: { message?: unknown } };
    return typeof body.error?.message === "string" ? body.error.message : null;
  } catch {
    return null;
  }
}

export function DownloadButton({
  href,
  label,
  what,
  fallbackName,
  testId,
  describedBy,
}: {
  href: string;
  /** The button's text, e.g. "Report (PDF)". */
  label: string;
  /** What is prepared, for the status sentences: "PDF report", "peaks CSV". */
  what: string;
  /** The file name when the reply names none. */
  fallbackName: string;
  testId?: string;
  describedBy?: string;
}) {
  const [status, setStatus] = useState<Status>({ state: "idle" });
  const statusId = useId();
  const started = useRef(0);

  // The seconds waited, once a second, while preparing.
  useEffect(() => {
    if (status.state !== "preparing") return;
    const timer = setInterval(() => {
      setStatus((now) =>
        now.state === "preparing"
          ? { state: "preparing", seconds: Math.floor((Date.now() - started.current) / 1000) }
          : now,
      );
    }, 1000);
    return () => clearInterval(timer);
  }, [status.state]);

  async function download() {
    started.current = Date.now();
    setStatus({ state: "preparing", seconds: 0 });
    let response: Response;
    try {
      response = await fetch(href, { credentials: "same-origin" });
    } catch {
      setStatus({ state: "failed", message: failureText(what, null, null) });
      return;
    }
    if (!response.ok) {
      setStatus({
        state: "failed",
        message: failureText(what, response.status, await reasonOf(response)),
      });
      return;
    }
    const blob = await response.blob();
    const fileName = fileNameFromDisposition(
      response.headers.get("content-disposition"),
      fallbackName,
    );
    const url = URL.createObjectURL(blob);
    const anchor = document.createElement("a");
    anchor.href = url;
    anchor.download = fileName;
    document.body.append(anchor);
    anchor.click();
    anchor.remove();
    // The browser has taken the file once the click is handled; the URL is released a moment later.
    setTimeout(() => URL.revokeObjectURL(url), 10_000);
    setStatus({ state: "ready", fileName });
  }

  const preparing = status.state === "preparing";
  return (
    <span className="inline-flex flex-col gap-0.5">
      <button
        type="button"
        className={BUTTON}
        onClick={download}
        disabled={preparing}
        aria-busy={preparing || undefined}
        aria-describedby={[statusId, describedBy].filter(Boolean).join(" ")}
        data-testid={testId}
      >
        {preparing ? (
          <span
            aria-hidden
            className="inline-block h-3 w-3 animate-spin rounded-full border-2 border-current border-t-transparent"
          />
        ) : null}
        {label}
      </button>
      <span
        id={statusId}
        role="status"
        aria-live="polite"
        className={`text-xs ${status.state === "failed" ? "text-red-700 dark:text-red-300" : "muted"}`}
        data-testid={testId ? `${testId}-status` : undefined}
      >
        {status.state === "preparing"
          ? preparingText(what, status.seconds)
          : status.state === "ready"
            ? readyText(status.fileName)
            : status.state === "failed"
              ? status.message
              : null}
      </span>
    </span>
  );
}
