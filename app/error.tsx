"use client";
// Shown when a page fails outside a segment with its own boundary (the workspace's layout itself, the
// sign-in pages): most often because the database is unreachable, which PageError then says.
import { PageError } from "@/components/ui/page-error";

export default function RootError({ reset }: { error: Error; reset: () => void }) {
  return (
    <main className="mx-auto max-w-2xl p-6">
      <PageError reset={reset} unchanged="Nothing was saved." />
    </main>
  );
}
