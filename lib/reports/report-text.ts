// The fixed wording every report carries, which the run pages show too: what a call is worth, and the
// cautions of a flame test.

/** On every page of a report: a call is a screening aid, never a certified analysis. */
export const SCREENING_CAVEAT =
  "Qualitative screening result only, not a certified analysis: confirm by an accredited method where a decision depends on it.";

/** Shown when the run's source is a flame; the lab's own rules take precedence. */
export const FLAME_CAUTIONS: string[] = [
  "An open flame: keep flammable solvents (ethanol, methanol, acetone) capped and away from it.",
  "Many test salts are toxic (barium, thallium, copper and strontium compounds among them): wear gloves and eye protection, work in a fume hood, and dispose of residues as your lab requires.",
  "Follow your lab's own safety rules and local regulations; they take precedence over this note.",
];
