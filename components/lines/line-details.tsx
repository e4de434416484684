// Every value of one line, labelled, for its own page.
import type { LineRecord } from "@/lib/services/line-library-types";
import { SOURCE_KINDS } from "@/lib/spectrum/types";
import { Flags, RetiredMark, SOURCE_LABELS, Value, VerifiedMark } from "./line-values";

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="contents">
      <dt className="muted">{label}</dt>
      <dd className="tabular">{children}</dd>
    </div>
  );
}

export function LineDetails({ line }: { line: LineRecord }) {
  return (
    <dl className="grid grid-cols-[10rem_1fr] gap-x-3 gap-y-1 text-sm" data-testid="line-values">
      <Row label="Species">
        {line.species} {line.retired ? <RetiredMark /> : null}
      </Row>
      <Row label="Air wavelength">
        <Value value={line.airNm} decimals={4} /> nm
      </Row>
      <Row label="Vacuum wavelength">
        <Value value={line.vacuumNm} decimals={4} /> nm
      </Row>
      <Row label="Uncertainty">
        ± <Value value={line.uncertaintyNm} /> nm
      </Row>
      {SOURCE_KINDS.map((kind) => (
        <Row key={kind} label={`Intensity, ${SOURCE_LABELS[kind].toLowerCase()}`}>
          <Value value={line.intensities[kind]} />
        </Row>
      ))}
      <Row label="E lower">
        <Value value={line.lowerEv} /> eV
      </Row>
      <Row label="E upper">
        <Value value={line.upperEv} /> eV
      </Row>
      <Row label="g (upper)">
        <Value value={line.g} />
      </Row>
      <Row label="A">
        <Value value={line.a} exponent /> s⁻¹
      </Row>
      <Row label="Flags">
        <Flags flags={line.flags} />
      </Row>
      {line.band ? (
        <Row label="Band">
          extends {line.band.extentNm} nm, fades towards the {line.band.degradesTo}
        </Row>
      ) : null}
      <Row label="Source">{line.source}</Row>
      {line.note ? <Row label="Note">{line.note}</Row> : null}
      <Row label="Checked">
        <VerifiedMark verified={line.verified} />
        {line.verified && line.verifiedByName ? (
          <span className="muted">
            {" "}
            by {line.verifiedByName}
            {line.verifiedAt ? `, ${line.verifiedAt.slice(0, 10)}` : ""}
          </span>
        ) : null}
        {line.verified ? (
          <span className="block" data-testid="verified-against">
            {line.verifiedCitation
              ? `Against the reference: ${line.verifiedCitation}`
              : "Against the row's own source"}
          </span>
        ) : null}
      </Row>
    </dl>
  );
}
