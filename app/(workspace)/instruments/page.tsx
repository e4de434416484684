// Instruments: the team's spectrometers and their calibration history.
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { requireWorkspace } from "@/lib/services/workspace";

export const metadata = { title: "Instruments" };

export default async function InstrumentsPage() {
  const { team } = await requireWorkspace();
  const lead = team?.role === "lab_lead";
  return (
    <>
      <PageHeader title="Instruments" description="Spectrometers, their dispersion and their lamp calibrations." />
      <EmptyState title="No instruments yet">
        {lead
          ? "Add the team's spectrometers: prism or grating, pixel count, nominal range and resolution. Chemists then calibrate them against a reference lamp."
          : "A lab lead adds the team's spectrometers. Once one is here you can calibrate it against a reference lamp."}
      </EmptyState>
    </>
  );
}
