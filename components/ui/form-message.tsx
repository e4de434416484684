// The one message above or below a form: an error or a confirmation, read out by screen readers.
export function FormMessage({
  message,
  tone = "error",
}: {
  message?: string | null;
  tone?: "error" | "ok";
}) {
  return (
    <div
      role={tone === "error" ? "alert" : "status"}
      aria-live="polite"
      className={
        tone === "error"
          ? "text-sm text-red-700 dark:text-red-300"
          : "text-sm text-teal-700 dark:text-teal-300"
      }
    >
      {message ? <p>{message}</p> : null}
    </div>
  );
}
