"use client";
// Shown when a page of the line library fails: nothing was changed in the table.
import { PageError } from "@/components/ui/page-error";

export default function LinesError({ reset }: { error: Error; reset: () => void }) {
  return <PageError reset={reset} unchanged="Nothing in the line table was changed." />;
}
