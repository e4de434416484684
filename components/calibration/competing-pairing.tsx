// A competing automatic pairing: the pairing found another way to pair the lamp's peaks with its lines
// that explains the spectrum nearly as well, so the choice is the chemist's. Trying it swaps the
// automatic pairs for the competing ones (as exclusions and pairs made by hand, so the record says
// what was changed); going back restores the first pairing.
import { Button } from "@/components/ui/button";
import { countOf } from "@/lib/text/count-of";

export interface CompetingPair {
  pixel: number;
  wavelengthNm: number;
  species: string;
}

export function CompetingPairing({
  rival,
  tried,
  disabled,
  onTry,
  onBack,
}: {
  rival: readonly CompetingPair[];
  /** Whether the workbench now shows the competing pairing. */
  tried: boolean;
  disabled: boolean;
  onTry: () => void;
  onBack: () => void;
}) {
  return (
    <section
      aria-labelledby="rival-heading"
      className="panel flex flex-col gap-2 p-3"
      data-testid="competing-pairing"
    >
      <h2 id="rival-heading" className="text-sm font-semibold">
        A competing pairing ({countOf(rival.length, "pair")})
      </h2>
      <p className="muted text-sm">
        The lamp&apos;s peaks can also be paired this way, nearly as convincingly. Compare both on
        the chart and in the residuals, and keep the one whose lines you recognise in the lamp.
      </p>
      <ul
        aria-labelledby="rival-heading"
        className="flex flex-wrap gap-x-4 gap-y-1 font-mono text-xs"
      >
        {rival.map((p) => (
          <li key={`${p.pixel}-${p.wavelengthNm}`}>
            pixel {p.pixel.toFixed(1)} → {p.species} {p.wavelengthNm.toFixed(3)} nm
          </li>
        ))}
      </ul>
      <div>
        {tried ? (
          <Button type="button" variant="quiet" disabled={disabled} onClick={onBack}>
            Back to the first pairing
          </Button>
        ) : (
          <Button type="button" variant="quiet" disabled={disabled} onClick={onTry}>
            Try the competing pairing
          </Button>
        )}
      </div>
    </section>
  );
}
