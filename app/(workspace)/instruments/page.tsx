// Instruments: the team's spectrometers with their newest calibration; lab leads add new ones here.
import Link from "next/link";
import { InstrumentForm } from "@/components/instruments/instrument-form";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { can } from "@/lib/auth/policy";
import { fetchCalibration } from "@/lib/services/calibrations";
import { fetchInstruments } from "@/lib/services/instruments";
import { requireWorkspace } from "@/lib/services/workspace";
import { GLASS_NAMES } from "@/lib/spectrum/calibration";
import { createInstrumentAction } from "./actions";
import { TableScroll } from "@/components/ui/table-scroll";

export const metadata = { title: "Instruments" };

const nm = (value: number, digits = 0) => value.toFixed(digits);

export default async function InstrumentsPage() {
  const { actor, team } = await requireWorkspace();
  if (!team)
    return <EmptyState title="You are not in a team yet">Ask a lab lead to invite you.</EmptyState>;
  const lead = can(actor, "instrument.manage", { teamId: team.teamId });
  const instruments = await fetchInstruments(actor, team.teamId);
  const latest = new Map(
    await Promise.all(
      instruments
        .filter((i) => i.latestCalibrationId)
        .map(async (i) => [i.id, await fetchCalibration(actor, i.latestCalibrationId!)] as const),
    ),
  );
  return (
    <>
      <PageHeader
        title="Instruments"
        description="Spectrometers, their dispersion and their lamp calibrations."
      />
      {instruments.length === 0 ? (
        <EmptyState title="No instruments yet">
          {lead
            ? "Add the team's spectrometers below: prism or grating, pixel count, nominal range and resolution. Chemists then calibrate them against a reference lamp."
            : "A lab lead adds the team's spectrometers. Once one is here you can calibrate it against a reference lamp."}
        </EmptyState>
      ) : (
        <TableScroll label="Instruments" className="panel">
          <table className="w-full text-sm">
            <caption className="sr-only">The team&apos;s instruments</caption>
            <thead className="border-b border-[var(--line)] text-left">
              <tr>
                <th scope="col" className="px-3 py-2">
                  Name
                </th>
                <th scope="col" className="px-3 py-2">
                  Dispersion
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Pixels
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Nominal range (nm)
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  Resolution (nm)
                </th>
                <th scope="col" className="px-3 py-2">
                  Newest calibration
                </th>
                <th scope="col" className="px-3 py-2 text-right">
                  RMS (nm)
                </th>
              </tr>
            </thead>
            <tbody>
              {instruments.map((instrument) => {
                const calibration = latest.get(instrument.id);
                return (
                  <tr key={instrument.id} className="border-b border-[var(--line)] last:border-0">
                    <td className="px-3 py-2">
                      <Link
                        href={`/instruments/${instrument.id}`}
                        className="font-medium underline"
                      >
                        {instrument.name}
                      </Link>
                    </td>
                    <td className="px-3 py-2">{instrument.dispersion}</td>
                    <td className="px-3 py-2 text-right font-mono">{instrument.pixels}</td>
                    <td className="px-3 py-2 text-right font-mono">
                      {nm(instrument.nominalMinNm)}–{nm(instrument.nominalMaxNm)}
                    </td>
                    <td className="px-3 py-2 text-right font-mono">
                      {nm(instrument.resolutionNm, 2)}
                    </td>
                    <td className="px-3 py-2">
                      {calibration ? (
                        <Link href={`/calibrations/${calibration.id}`} className="underline">
                          {calibration.calibratedOn} · {calibration.model}
                        </Link>
                      ) : (
                        <span className="muted">
                          <span aria-hidden>○ </span>Not calibrated yet
                        </span>
                      )}
                    </td>
                    <td className="px-3 py-2 text-right font-mono">
                      {calibration ? calibration.rmsNm.toFixed(3) : "—"}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </TableScroll>
      )}
      {lead ? (
        <div className="mt-6 max-w-3xl">
          <InstrumentForm
            teamId={team.teamId}
            glassNames={GLASS_NAMES}
            action={createInstrumentAction}
          />
        </div>
      ) : null}
    </>
  );
}
