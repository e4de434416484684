// Options shared by the air ⇄ vacuum conversions: what to do outside the Morton (2000) formula's range.

export interface AirVacuumOptions {
  /**
   * What to do with a wavelength below the formula's range (vacuum < 200 nm, or air below
   * 199.936 nm, the air wavelength of 200 nm vacuum): "throw" raises a RangeError, "unchanged"
   * returns the input as it is (tables give wavelengths below 200 nm in vacuum anyway).
   * @default "throw"
   */
  belowRange?: "throw" | "unchanged";
}
