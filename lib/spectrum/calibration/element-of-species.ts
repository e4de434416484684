// The element of a species label ("Hg" of "Hg I"): lamp intensities compare lines of one element only.

/** Labels already read: one pairing asks for the same few labels many thousands of times. */
const known = new Map<string, string>();

/** The element symbol that opens a species label such as "Hg I" or "Ar II". */
export function elementOfSpecies(species: string): string {
  let element = known.get(species);
  if (element === undefined) {
    element = species.trim().split(/\s+/)[0];
    if (known.size < 10_000) known.set(species, element);
  }
  return element;
}
