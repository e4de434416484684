// Notices every identification shows: what the tool's calls are worth, and for a flame the cautions.
export function ScreeningNotice() {
  return (
    <p className="muted text-sm" data-testid="screening-notice">
      A screening aid, not a certified analysis. Confirmation by an accredited method is the lab&apos;s decision.
    </p>
  );
}

export function FlameCautions() {
  return (
    <aside
      aria-label="Flame safety"
      className="rounded border border-ember-600 bg-ember-50 p-3 text-sm text-ember-900 dark:bg-ink-800 dark:text-ember-100"
    >
      <p className="font-semibold">
        <span aria-hidden>⚠ </span>Flame test cautions
      </p>
      <ul className="mt-1 list-disc pl-5">
        <li>An open flame: keep flammable solvents (ethanol, methanol, acetone) capped and away from it.</li>
        <li>
          Many test salts are toxic: barium, thallium, copper and strontium compounds among them. Wear gloves and eye
          protection, work in a fume hood, and dispose of residues as your lab requires.
        </li>
        <li>Follow your lab&apos;s own safety rules and local regulations; they take precedence over this note.</li>
      </ul>
    </aside>
  );
}
