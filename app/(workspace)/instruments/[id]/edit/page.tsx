// Editing an instrument (lab leads of its team; anyone else finds nothing here): the add form again,
// filled in, with the dispersion and pixel count fixed once the instrument has calibrations. The export
// profile (how files without a header are read) is changed here.
import Link from "next/link";
import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { InstrumentForm } from "@/components/instruments/instrument-form";
import { idOrNotFound, orNotFound } from "@/lib/http/page-not-found";
import { can } from "@/lib/auth/policy";
import { fetchInstrument } from "@/lib/services/instruments";
import { requireWorkspace } from "@/lib/services/workspace";
import { GLASS_NAMES } from "@/lib/spectrum/calibration";
import { updateInstrumentAction } from "../../actions";

export const metadata = { title: "Edit instrument" };

export default async function EditInstrumentPage({ params }: { params: Promise<{ id: string }> }) {
  const { actor } = await requireWorkspace();
  const id = idOrNotFound((await params).id);
  const instrument = await orNotFound(fetchInstrument(actor, id));
  if (!can(actor, "instrument.manage", { teamId: instrument.teamId })) notFound();
  return (
    <>
      <PageHeader
        title={`Edit ${instrument.name}`}
        description="Change the instrument's name, nominal range, resolution, detector maximum, prism data or export profile. Calibrations and spectra already stored are kept as they are."
        actions={
          <Link
            href={`/instruments/${id}`}
            className="rounded border border-[var(--line)] px-3 py-1.5 text-sm hover:bg-ink-100 dark:hover:bg-ink-800"
          >
            Cancel
          </Link>
        }
      />
      <div className="max-w-3xl">
        <InstrumentForm
          teamId={instrument.teamId}
          glassNames={GLASS_NAMES}
          action={updateInstrumentAction}
          initial={{ ...instrument, calibrated: instrument.latestCalibrationId !== null }}
        />
      </div>
    </>
  );
}
