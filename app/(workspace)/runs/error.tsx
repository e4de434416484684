"use client";
// Shown when a run page fails: nothing was saved.
import { PageError } from "@/components/ui/page-error";

export default function RunError({ reset }: { error: Error; reset: () => void }) {
  return <PageError reset={reset} unchanged="Nothing was saved." />;
}
