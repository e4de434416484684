// Physical constants for unit conversions, from CODATA 2018 (exact by definition in the 2019 SI).

/** Speed of light in vacuum, m/s (CODATA 2018, exact). */
export const SPEED_OF_LIGHT_M_PER_S = 299_792_458;

/** Planck constant, J s (CODATA 2018, exact). */
export const PLANCK_J_S = 6.626_070_15e-34;

/** Elementary charge, C (CODATA 2018, exact); converts joules to electronvolts. */
export const ELEMENTARY_CHARGE_C = 1.602_176_634e-19;

/**
 * h·c in eV·nm (≈ 1239.841984 eV nm), derived from the exact CODATA 2018 values above so
 * that energy and wavelength conversions share one number.
 */
export const HC_EV_NM = ((PLANCK_J_S * SPEED_OF_LIGHT_M_PER_S) / ELEMENTARY_CHARGE_C) * 1e9;

/** Nanometres per ångström (exact). */
export const NM_PER_ANGSTROM = 0.1;

/** Nanometres per micrometre (exact). */
export const NM_PER_MICROMETRE = 1000;

/** 1 cm⁻¹ ↔ 1e7 nm: wavenumber in cm⁻¹ times vacuum wavelength in nm (exact). */
export const NM_CM = 1e7;
