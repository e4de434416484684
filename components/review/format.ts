// Display helpers of the review area: how long a run has waited, and a stored time in the reader's words.

/** "12 min", "5 h", "3 d": the largest whole unit of a wait. */
export function formatWaiting(seconds: number): string {
  if (seconds < 60) return "under a minute";
  const minutes = Math.floor(seconds / 60);
  if (minutes < 60) return `${minutes} min`;
  const hours = Math.floor(minutes / 60);
  if (hours < 48) return `${hours} h`;
  return `${Math.floor(hours / 24)} d`;
}

/** An ISO time as "YYYY-MM-DD HH:MM UTC". */
export function formatTime(iso: string): string {
  return `${iso.slice(0, 16).replace("T", " ")} UTC`;
}
