// Calibrate an instrument on the workbench: the lamp spectrum (chosen after its upload), the lamp gases,
// then pairs, residuals and models previewed live; saving records what the preview showed.
import Link from "next/link";
import { CalibrationWorkbench } from "@/components/calibration/calibration-workbench";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { idOrNotFound, orNotFound } from "@/lib/http/page-not-found";
import { fetchSpectrumSeries } from "@/lib/services/run-spectrum";
import { X_TITLES } from "@/components/uploads/first-column-labels";
import { fetchCalibration } from "@/lib/services/calibrations";
import { fetchInstrument } from "@/lib/services/instruments";
import { fetchSpectrum } from "@/lib/services/spectra";
import { requireWorkspace } from "@/lib/services/workspace";
import { LAMP_GASES, MODEL_CHOICES } from "@/lib/validation/calibration-schemas";
import { saveCalibrationAction } from "./actions";

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
  const spectrum =
    typeof given === "string" ? await orNotFound(fetchSpectrum(actor, idOrNotFound(given))) : null;
  const header = (
    <PageHeader
      title={`Calibrate ${instrument.name}`}
      description={`Lamp lines of the team's newest line-table release between ${instrument.nominalMinNm} and ${instrument.nominalMaxNm} nm are paired with the lamp's peaks; check the pairs and the model, then save.`}
    />
  );
  if (!spectrum || spectrum.kind !== "lamp" || spectrum.instrumentId !== id) {
    return (
      <>
        {header}
        <EmptyState
          title={
            spectrum
              ? "That spectrum is not a lamp of this instrument"
              : "Choose a lamp spectrum first"
          }
        >
          Upload the reference lamp recorded on this instrument; its page then offers
          &ldquo;Calibrate with this lamp&rdquo;.{" "}
          <Link href={`/instruments/${id}/upload?kind=lamp`} className="underline">
            Upload a lamp spectrum
          </Link>
          .
        </EmptyState>
      </>
    );
  }
  const current = instrument.latestCalibrationId
    ? await fetchCalibration(actor, instrument.latestCalibrationId)
    : null;
  return (
    <>
      {header}
      <p className="mb-1 text-sm">
        Lamp spectrum: <span className="font-medium">{spectrum.label || spectrum.fileName}</span>{" "}
        <span className="muted">
          ({spectrum.points.toLocaleString("en")} points, uploaded{" "}
          {spectrum.uploadedAt.slice(0, 10)})
        </span>
      </p>
      <p className="muted mb-3 text-sm" data-testid="current-calibration">
        {current ? (
          <>
            New runs now use the{" "}
            <Link href={`/calibrations/${current.id}`} className="underline">
              calibration of {current.calibratedOn}
            </Link>{" "}
            ({current.model}, RMS {current.rmsNm.toFixed(4)} nm); a saved calibration takes its
            place, and its page shows the drift between the two.
          </>
        ) : (
          "This instrument has no calibration yet; the one you save becomes the default for new runs."
        )}
      </p>
      <CalibrationWorkbench
        instrumentId={id}
        spectrumId={spectrum.id}
        spectrum={await orNotFound(fetchSpectrumSeries(actor, spectrum.id))}
        xTitle={X_TITLES[spectrum.xUnit]}
        lampGases={LAMP_GASES}
        models={MODEL_CHOICES}
        saveAction={saveCalibrationAction}
      />
    </>
  );
}
