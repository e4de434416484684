// One notebook: its runs (status, species called present, instrument, date) and "New run" for a
// sample chosen after its upload (?spectrum=), or the way to upload one.
import Link from "next/link";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { RunForm } from "@/components/workflow/run-form";
import { ScreeningNotice } from "@/components/workflow/run-notices";
import { idOrNotFound, orNotFound } from "@/components/workflow/server-data";
import { fetchCalibrations } from "@/lib/services/calibrations";
import { fetchInstruments } from "@/lib/services/instruments";
import { fetchNotebooks } from "@/lib/services/notebooks";
import { fetchNotebookRuns } from "@/lib/services/runs";
import { fetchSpectrum } from "@/lib/services/spectra";
import { requireWorkspace } from "@/lib/services/workspace";
import { startRunAction } from "../actions";

export const metadata = { title: "Notebook" };

export default async function NotebookPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { actor, team } = await requireWorkspace();
  const id = idOrNotFound((await params).id);
  const given = (await searchParams).spectrum;
  const runs = await orNotFound(fetchNotebookRuns(actor, id));
  const notebook = team ? (await fetchNotebooks(actor, team.teamId)).find((n) => n.id === id) : undefined;
  const teamId = notebook?.teamId ?? team?.teamId;
  const instruments = teamId ? await fetchInstruments(actor, teamId) : [];
  const instrumentName = new Map(instruments.map((i) => [i.id, i.name]));
  const spectra = new Map(
    await Promise.all([...new Set(runs.map((r) => r.spectrumId))].map(async (sid) => [sid, await fetchSpectrum(actor, sid)] as const)),
  );
  const sample = typeof given === "string" ? await orNotFound(fetchSpectrum(actor, idOrNotFound(given))) : null;
  const calibrations = sample ? await fetchCalibrations(actor, sample.instrumentId) : [];
  const usable = calibrations;

  return (
    <>
      <PageHeader title={notebook?.title ?? "Notebook"} description={`${runs.length} ${runs.length === 1 ? "run" : "runs"}`} />
      <ScreeningNotice />
      <h2 className="mb-2 mt-4 text-lg font-semibold">Runs</h2>
      {runs.length > 0 ? (
        <a href={`/api/notebooks/${id}/calls.csv`} download className="mb-2 inline-block text-sm underline" data-testid="download-calls-csv">
          Calls CSV (every run&apos;s calls)
        </a>
      ) : null}
      {runs.length === 0 ? (
        <EmptyState title="No runs yet">A run analyses one sample spectrum on a calibration and calls the elements it shows.</EmptyState>
      ) : (
        <div className="panel overflow-x-auto">
          <table className="w-full text-sm" data-testid="runs-table">
            <caption className="sr-only">Runs of this notebook, newest first</caption>
            <thead className="border-b border-[var(--line)] text-left">
              <tr>
                <th scope="col" className="px-3 py-2">Date</th>
                <th scope="col" className="px-3 py-2">Sample</th>
                <th scope="col" className="px-3 py-2">Status</th>
                <th scope="col" className="px-3 py-2">Called present</th>
                <th scope="col" className="px-3 py-2">Source</th>
                <th scope="col" className="px-3 py-2">Instrument</th>
              </tr>
            </thead>
            <tbody>
              {runs.map((r) => {
                const spectrum = spectra.get(r.spectrumId);
                return (
                  <tr key={r.id} className="border-b border-[var(--line)] last:border-0">
                    <td className="px-3 py-2">
                      <Link href={`/runs/${r.id}`} className="underline">
                        {r.createdAt.slice(0, 16).replace("T", " ")}
                      </Link>
                    </td>
                    <td className="px-3 py-2">{spectrum ? spectrum.label || spectrum.fileName : "—"}</td>
                    <td className="px-3 py-2">
                      <span aria-hidden>● </span>
                      {r.status}
                    </td>
                    <td className="px-3 py-2">{r.present.length ? r.present.join(", ") : <span className="muted">none</span>}</td>
                    <td className="px-3 py-2">{r.source}</td>
                    <td className="px-3 py-2">{spectrum ? (instrumentName.get(spectrum.instrumentId) ?? "—") : "—"}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      )}
      <div className="mt-6">
        {sample && sample.kind === "sample" ? (
          <>
            <p className="mb-2 text-sm">
              Sample: <span className="font-medium">{sample.label || sample.fileName}</span>{" "}
              <span className="muted">
                on {instrumentName.get(sample.instrumentId) ?? "its instrument"}, {sample.points.toLocaleString("en")} points ({sample.xUnit}{" "}
                axis)
              </span>
            </p>
            {usable.length === 0 && sample.xUnit === "pixel" ? (
              <EmptyState title="This instrument is not calibrated yet">
                A sample on a pixel axis needs a lamp calibration.{" "}
                <Link href={`/instruments/${sample.instrumentId}/calibrate`} className="underline">
                  Calibrate the instrument
                </Link>{" "}
                first.
              </EmptyState>
            ) : (
              <RunForm
                notebookId={id}
                spectrumId={sample.id}
                calibrations={usable.map((c) => ({ id: c.id, label: `${c.calibratedOn} · ${c.model} · RMS ${c.rmsNm.toFixed(3)} nm` }))}
                allowOwnAxis={sample.xUnit !== "pixel"}
                action={startRunAction}
              />
            )}
          </>
        ) : (
          <section className="panel max-w-3xl p-4" aria-labelledby="new-run">
            <h2 id="new-run" className="text-lg font-semibold">
              New run
            </h2>
            <p className="muted mt-1 text-sm">Upload the sample spectrum on the instrument that recorded it; the run starts from there.</p>
            {instruments.length === 0 ? (
              <p className="mt-2 text-sm">
                The team has no instruments yet: a lab lead adds them under{" "}
                <Link href="/instruments" className="underline">
                  Instruments
                </Link>
                .
              </p>
            ) : (
              <ul className="mt-2 flex flex-wrap gap-2">
                {instruments.map((i) => (
                  <li key={i.id}>
                    <Link
                      href={`/instruments/${i.id}/upload?kind=sample&notebook=${id}`}
                      className="inline-block rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
                    >
                      Upload a sample on {i.name}
                    </Link>
                  </li>
                ))}
              </ul>
            )}
          </section>
        )}
      </div>
    </>
  );
}
