"use client";
// Shown when a notebook page fails: nothing was saved.
import { PageError } from "@/components/ui/page-error";

export default function NotebooksError({ reset }: { error: Error; reset: () => void }) {
  return <PageError reset={reset} unchanged="Nothing was saved." />;
}
