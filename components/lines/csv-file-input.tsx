"use client";
// The file field of the line table's CSV forms (import, reference check): CSV only, described by its
// hint and error regions, and a file over the form's limit cleared at once with the caller told.

export function CsvFileInput({
  id,
  maxBytes,
  onTooLarge,
}: {
  /** The input's id; its hint and error regions are `${id}-hint` and `${id}-error`. */
  id: string;
  /** The largest file the form's use case takes (MAX_IMPORT_BYTES, MAX_REFERENCE_BYTES). */
  maxBytes: number;
  /** Called on every choice with whether the file exceeds maxBytes. */
  onTooLarge: (tooLarge: boolean) => void;
}) {
  return (
    <input
      id={id}
      name="file"
      type="file"
      accept=".csv,text/csv"
      aria-describedby={`${id}-hint ${id}-error`}
      className="text-sm file:mr-3 file:rounded file:border file:border-[var(--line)] file:bg-[var(--panel)] file:px-2 file:py-1"
      onChange={(event) => {
        const file = event.currentTarget.files?.[0];
        const large = Boolean(file && file.size > maxBytes);
        onTooLarge(large);
        if (large) event.currentTarget.value = "";
      }}
    />
  );
}
