// The run's Boltzmann excitation temperature (T ± σ, the species and lines it came from, R²) with a
// small plot, or why none could be found.
import { BoltzmannChart } from "@/components/charts/spectrum-charts";
import type { RunTemperature } from "@/lib/runs/types";
import { countOf } from "@/lib/text/count-of";

export function RunTemperaturePanel({
  temperature,
  assumedK,
}: {
  temperature: RunTemperature | null;
  assumedK?: number;
}) {
  const assumed = assumedK ? (
    <p className="muted text-xs">
      Expected intensities assumed an excitation temperature of {assumedK} K where the table has g,
      A and upper energies.
    </p>
  ) : null;
  if (!temperature)
    return <p className="muted text-sm">This run was stored before temperatures were computed.</p>;
  if (!temperature.ok) {
    return (
      <div className="flex flex-col gap-1" data-testid="temperature">
        <p className="text-sm">No excitation temperature could be found: {temperature.message}</p>
        {assumed}
      </div>
    );
  }
  return (
    <div
      className="grid grid-cols-1 gap-3 md:grid-cols-[minmax(16rem,1fr)_2fr]"
      data-testid="temperature"
    >
      <div className="flex flex-col gap-1 text-sm">
        <p className="text-base">
          <span className="font-semibold font-mono">
            {Math.round(temperature.temperatureK)} ±{" "}
            {Math.round(temperature.temperatureUncertaintyK)} K
          </span>
        </p>
        <p>
          From {countOf(temperature.lineCount, "line")} of {temperature.species} · R²{" "}
          {temperature.rSquared.toFixed(3)}
        </p>
        <p className="muted text-xs">
          A Boltzmann plot of the peaks&apos; areas with the table&apos;s g, A and upper-level
          energies; it assumes local thermodynamic equilibrium and an optically thin source, and σ
          comes from the slope&apos;s standard error only.
        </p>
        {assumed}
      </div>
      <BoltzmannChart points={temperature.points} temperatureK={temperature.temperatureK} />
    </div>
  );
}
