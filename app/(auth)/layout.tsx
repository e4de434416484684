// The frame of the signed-out pages: the name, one card, and a line on what Emberline is.
import type { ReactNode } from "react";

export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <main className="flex min-h-screen items-center justify-center p-6">
      <div className="w-full max-w-sm">
        <p className="mb-1 text-2xl font-semibold tracking-tight">
          <span className="text-ember-600" aria-hidden>
            ◆
          </span>{" "}
          Emberline
        </p>
        <p className="muted mb-5 text-sm">
          The team notebook for emission-spectra identifications.
        </p>
        <div className="panel p-5">{children}</div>
      </div>
    </main>
  );
}
