// One notebook: its runs with filters (status, species called present, instrument, search; kept in the
// URL), renaming it, and "New run" with a picker of the instrument's sample spectra (the one just
// uploaded preselected when ?spectrum= names it).
import { DownloadButton } from "@/components/ui/download-button";
import Link from "next/link";
import { notFound } from "next/navigation";
import { RenameNotebookForm } from "@/components/notebooks/rename-notebook-form";
import { RunList } from "@/components/notebooks/run-list";
import { RUN_FILTER_KEYS, oneParam, runsKey, spectraKey } from "@/components/notebooks/list-keys";
import { PageHeader } from "@/components/ui/page-header";
import { RunForm } from "@/components/runs/run-form";
import { ScreeningNotice } from "@/components/runs/run-notices";
import { idOrNotFound, orNotFound } from "@/lib/http/page-not-found";
import { fetchCalibrations } from "@/lib/services/calibrations";
import { fetchInstruments } from "@/lib/services/instruments";
import { fetchNotebook, fetchNotebookRuns } from "@/lib/services/notebooks";
import { fetchSpectra, fetchSpectrum } from "@/lib/services/spectra";
import type { RunSummary } from "@/lib/services/notebook-types";
import { requireWorkspace } from "@/lib/services/workspace";
import { notebookRunsQuerySchema } from "@/lib/validation/notebook-schemas";
import { renameNotebookAction, startRunAction } from "../actions";

export const metadata = { title: "Notebook" };

export default async function NotebookPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { actor } = await requireWorkspace();
  const id = idOrNotFound((await params).id);
  const search = await searchParams;
  const notebook = await orNotFound(fetchNotebook(actor, id));
  const instruments = await fetchInstruments(actor, notebook.teamId);

  // The runs under the URL's filters become SWR's fallback; filters the API would refuse get none,
  // so the browser asks and shows the API's message.
  const filters = Object.fromEntries(RUN_FILTER_KEYS.map((k) => [k, oneParam(search[k])]));
  const query = notebookRunsQuerySchema.safeParse(filters);
  const runFallback: Record<string, RunSummary[]> = query.success
    ? { [runsKey(id, filters)]: await fetchNotebookRuns(actor, id, query.data) }
    : {};

  // The run form's preselection: the sample named in the URL (of this team), else the first instrument.
  const given = oneParam(search.spectrum);
  const sample = given ? await orNotFound(fetchSpectrum(actor, idOrNotFound(given))) : null;
  if (sample && sample.teamId !== notebook.teamId) notFound();
  const instrumentId = sample?.instrumentId ?? instruments[0]?.id;
  const formFallback: Record<string, unknown> = {};
  if (instrumentId) {
    const instrument = instruments.find((i) => i.id === instrumentId)!;
    formFallback[spectraKey(notebook.teamId, instrumentId, "sample")] = await fetchSpectra(
      actor,
      notebook.teamId,
      { instrumentId, kind: "sample" },
    );
    formFallback[`/api/instruments/${instrumentId}`] = {
      ...instrument,
      calibrations: await fetchCalibrations(actor, instrumentId),
    };
  }

  return (
    <>
      <PageHeader
        title={notebook.title}
        description={`${notebook.runCount} ${notebook.runCount === 1 ? "run" : "runs"} · opened ${notebook.createdAt.slice(0, 10)} · last activity ${notebook.lastActivityAt.slice(0, 10)}`}
      />
      <RenameNotebookForm
        notebookId={id}
        title={notebook.title}
        version={notebook.version}
        action={renameNotebookAction}
      />
      <ScreeningNotice />
      <div className="mt-4">
        {notebook.runCount > 0 ? (
          <div className="mb-2">
            <DownloadButton
              href={`/api/notebooks/${id}/calls.csv`}
              label="Calls CSV (every run's calls)"
              what="calls CSV"
              fallbackName="emberline-notebook-calls.csv"
              testId="download-calls-csv"
            />
          </div>
        ) : null}
        <RunList
          notebookId={id}
          instruments={instruments.map((i) => ({ id: i.id, name: i.name }))}
          fallback={runFallback}
        />
      </div>
      <div className="mt-6">
        {instruments.length === 0 || !instrumentId ? (
          <section className="panel max-w-3xl p-4" aria-labelledby="new-run">
            <h2 id="new-run" className="text-lg font-semibold">
              New run
            </h2>
            <p className="mt-2 text-sm">
              The team has no instruments yet: a lab lead adds them under{" "}
              <Link href="/instruments" className="underline">
                Instruments
              </Link>
              .
            </p>
          </section>
        ) : (
          <>
            <RunForm
              key={sample?.id ?? "none"}
              notebookId={id}
              teamId={notebook.teamId}
              instruments={instruments.map((i) => ({ id: i.id, name: i.name }))}
              initialInstrumentId={instrumentId}
              initialSpectrumId={sample?.kind === "sample" ? sample.id : undefined}
              fallback={formFallback}
              action={startRunAction}
            />
            <section className="mt-3 max-w-3xl text-sm" aria-label="Upload a sample">
              <p className="muted">
                A new sample? Upload it on the instrument that recorded it; the run form then has it
                selected.
              </p>
              <ul className="mt-2 flex flex-wrap gap-2">
                {instruments.map((i) => (
                  <li key={i.id}>
                    <Link
                      href={`/instruments/${i.id}/upload?kind=sample&notebook=${id}`}
                      className="inline-block rounded border border-[var(--line)] px-3 py-1.5 hover:bg-ink-100 dark:hover:bg-ink-800"
                    >
                      Upload a sample on {i.name}
                    </Link>
                  </li>
                ))}
              </ul>
            </section>
          </>
        )}
      </div>
    </>
  );
}
