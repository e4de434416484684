// The element of a species label ("Hg" of "Hg I"): lamp intensities compare lines of one element only.

/** The element symbol that opens a species label such as "Hg I" or "Ar II". */
export function elementOfSpecies(species: string): string {
  return species.trim().split(/\s+/)[0];
}
