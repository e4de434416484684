// Information criteria for choosing between calibration models fitted to the same pairs.

/** AICc and BIC of a least-squares fit with Gaussian errors. */
export interface InformationCriteria {
  /** Akaike's criterion with the small-sample correction (Hurvich & Tsai 1989); Infinity when n ≤ k + 1. */
  aicc: number;
  /** Schwarz's Bayesian criterion. */
  bic: number;
}

/**
 * From the weighted residual sum χ² of n points and k parameters, with the error scale estimated from
 * the data (so the likelihood term is n·ln(χ²/n)). Lamp calibrations have 5–40 pairs, where plain AIC
 * favours too many parameters; AICc corrects that, which is why the comparison ranks by AICc.
 */
export function informationCriteria(chiSquare: number, n: number, k: number): InformationCriteria {
  // A perfect fit (χ² = 0) would give −∞; floor it at a relative 1e-300 so ranking still works.
  const likelihoodTerm = n * Math.log(Math.max(chiSquare, 1e-300) / n);
  const aic = likelihoodTerm + 2 * k;
  const aicc = n - k - 1 > 0 ? aic + (2 * k * (k + 1)) / (n - k - 1) : Infinity;
  return { aicc, bic: likelihoodTerm + k * Math.log(n) };
}
