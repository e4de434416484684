// Calibrate an instrument: the lamp spectrum (chosen after its upload), the lamp gases and the model.
import Link from "next/link";
import { PreviewChart } from "@/components/charts/spectrum-charts";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { CalibrateForm } from "@/components/workflow/calibrate-form";
import { X_TITLES, idOrNotFound, orNotFound, rawSeries } from "@/components/workflow/server-data";
import { fetchInstrument } from "@/lib/services/instruments";
import { fetchSpectrum } from "@/lib/services/spectra";
import { requireWorkspace } from "@/lib/services/workspace";
import { LAMP_GASES, MODEL_CHOICES } from "@/lib/validation/workflow-forms";
import { calibrateAction } from "../../actions";

export const metadata = { title: "Calibrate" };

export default async function CalibratePage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { actor } = await requireWorkspace();
  const id = idOrNotFound((await params).id);
  const given = (await searchParams).spectrum;
  const instrument = await orNotFound(fetchInstrument(actor, id));
  const spectrum = typeof given === "string" ? await orNotFound(fetchSpectrum(actor, idOrNotFound(given))) : null;
  const header = (
    <PageHeader
      title={`Calibrate ${instrument.name}`}
      description={`Lamp lines of the team's newest line-table release between ${instrument.nominalMinNm} and ${instrument.nominalMaxNm} nm are paired with the lamp's peaks.`}
    />
  );
  if (!spectrum || spectrum.kind !== "lamp" || spectrum.instrumentId !== id) {
    return (
      <>
        {header}
        <EmptyState title={spectrum ? "That spectrum is not a lamp of this instrument" : "Choose a lamp spectrum first"}>
          Upload the reference lamp recorded on this instrument; its page then offers &ldquo;Calibrate with this lamp&rdquo;.{" "}
          <Link href={`/instruments/${id}/upload?kind=lamp`} className="underline">
            Upload a lamp spectrum
          </Link>
          .
        </EmptyState>
      </>
    );
  }
  return (
    <>
      {header}
      <p className="mb-3 text-sm">
        Lamp spectrum: <span className="font-medium">{spectrum.label || spectrum.fileName}</span>{" "}
        <span className="muted">
          ({spectrum.points.toLocaleString("en")} points, uploaded {spectrum.uploadedAt.slice(0, 10)})
        </span>
      </p>
      <div className="mb-4">
        <PreviewChart spectrum={await rawSeries(actor, spectrum.id)} xTitle={X_TITLES[spectrum.xUnit]} />
      </div>
      <CalibrateForm
        instrumentId={id}
        spectrumId={spectrum.id}
        lampGases={LAMP_GASES}
        models={MODEL_CHOICES}
        action={calibrateAction}
      />
    </>
  );
}
