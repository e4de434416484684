"use client";
// What a segment's error boundary shows: that the page failed, what was not changed, and a retry.
// A production build hides the server's error from the browser, so the page asks /api/health whether
// the database is the cause and then says so (and that trying again shortly should work).
import { useEffect, useState } from "react";

type Cause = "checking" | "database" | "other";

export function PageError({ reset, unchanged }: { reset: () => void; unchanged: string }) {
  const [cause, setCause] = useState<Cause>("checking");
  useEffect(() => {
    let live = true;
    fetch("/api/health", { cache: "no-store" })
      .then(async (response) => {
        const body = (await response.json().catch(() => null)) as {
          database?: { status?: string };
        } | null;
        if (live) setCause(body?.database?.status === "unreachable" ? "database" : "other");
      })
      .catch(() => live && setCause("other"));
    return () => {
      live = false;
    };
  }, []);
  const database = cause === "database";
  return (
    <div role="alert" className="panel max-w-lg p-5" data-error-cause={cause}>
      <h1 className="text-lg font-semibold">
        {database ? "The database is unreachable" : "This page could not be shown"}
      </h1>
      <p className="muted mt-1 text-sm">
        {database
          ? `Emberline cannot reach its database at the moment, so this page cannot be read. ${unchanged} Try again in a few seconds.`
          : `Something went wrong on the server. ${unchanged}`}
      </p>
      <button
        type="button"
        onClick={reset}
        className="mt-3 rounded bg-ember-600 px-3 py-1.5 text-sm text-white"
      >
        Try again
      </button>
    </div>
  );
}
