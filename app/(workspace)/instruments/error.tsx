"use client";
// Shown when an instruments page fails: nothing was saved.
import { PageError } from "@/components/ui/page-error";

export default function InstrumentsError({ reset }: { error: Error; reset: () => void }) {
  return <PageError reset={reset} unchanged="Nothing was saved." />;
}
