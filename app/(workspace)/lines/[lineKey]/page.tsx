// One line of the table: its values in the release it was opened from, and its whole history.
import Link from "next/link";
import { notFound } from "next/navigation";
import { LineDetails } from "@/components/lines/line-details";
import { LineHistory } from "@/components/lines/line-history";
import { releaseLabel } from "@/components/lines/line-values";
import { PageHeader } from "@/components/ui/page-header";
import { AppError } from "@/lib/errors";
import { fetchLine, fetchLineHistory, fetchRelease } from "@/lib/services/line-library-reads";
import { requireWorkspace } from "@/lib/services/workspace";

export const metadata = { title: "Line" };

/** A line or release that is not there (or not the actor's team's) is a 404, like every other resource. */
async function orNotFound<T>(promise: Promise<T>): Promise<T> {
  try {
    return await promise;
  } catch (error) {
    if (error instanceof AppError && (error.code === "not_found" || error.code === "validation"))
      notFound();
    throw error;
  }
}

export default async function LinePage({
  params,
  searchParams,
}: {
  params: Promise<{ lineKey: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { actor } = await requireWorkspace();
  const { lineKey } = await params;
  const { line: lineParam } = await searchParams;
  const lineId =
    typeof lineParam === "string" && /^[0-9a-f-]{36}$/i.test(lineParam) ? lineParam : undefined;
  const [history, line] = await Promise.all([
    orNotFound(fetchLineHistory(actor, decodeURIComponent(lineKey))),
    lineId ? orNotFound(fetchLine(actor, lineId)) : Promise.resolve(null),
  ]);
  if (line && line.lineKey !== decodeURIComponent(lineKey)) notFound();
  const release = line ? await orNotFound(fetchRelease(actor, line.releaseId)) : null;
  const title = line ? `${line.species} ${line.airNm ?? line.vacuumNm} nm` : "A line of the table";
  return (
    <>
      <nav aria-label="Breadcrumb" className="muted mb-2 text-sm">
        <Link href={release ? `/lines?release=${release.id}` : "/lines"} className="underline">
          Line library{release ? `, ${releaseLabel(release).toLowerCase()}` : ""}
        </Link>
      </nav>
      <PageHeader
        title={title}
        description={
          line
            ? `${line.airNm !== null ? "Air wavelength" : "Vacuum wavelength"}, as in ${release ? releaseLabel(release).toLowerCase() : "its release"}.`
            : undefined
        }
      />
      <div className="grid gap-5 lg:grid-cols-[minmax(0,28rem)_1fr]">
        <section className="panel p-4" aria-labelledby="values-heading">
          <h2 id="values-heading" className="mb-2 font-semibold">
            Values{release ? ` in ${releaseLabel(release).toLowerCase()}` : ""}
          </h2>
          {line ? (
            <LineDetails line={line} />
          ) : (
            <p className="muted text-sm">
              Open the line from a release&apos;s table to see its values there.
            </p>
          )}
        </section>
        <section className="panel p-4" aria-labelledby="history-heading">
          <h2 id="history-heading" className="mb-1 font-semibold">
            History
          </h2>
          <p className="muted mb-2 text-xs">
            Every change of this line in every release, oldest first, from the audit trail.
          </p>
          <LineHistory entries={history} />
        </section>
      </div>
    </>
  );
}
