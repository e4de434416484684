// The Boltzmann constant in the units the excitation-temperature code works in.

/** k in eV/K, CODATA 2018 recommended value (exact since the 2019 SI redefinition). */
export const BOLTZMANN_CONSTANT_EV_PER_K = 8.617333262e-5;
