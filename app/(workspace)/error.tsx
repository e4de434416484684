"use client";
// Shown when a workspace page fails: what happened, and a way to try again. Nothing was saved.
import { PageError } from "@/components/ui/page-error";

export default function WorkspaceError({ reset }: { error: Error; reset: () => void }) {
  return <PageError reset={reset} unchanged="Nothing you were doing was saved." />;
}
