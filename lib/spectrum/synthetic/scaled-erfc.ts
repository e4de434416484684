// The scaled complementary error function erfcx(z) = exp(z²)·erfc(z), for band-head profiles.

/**
 * erfcx(z) = exp(z²)·erfc(z) for z ≥ 0, from the Chebyshev-fitted approximation of
 * Numerical Recipes (erfcc, fractional error below 1.2e-7). Working with the scaled form keeps
 * the exponentially modified Gaussian free of overflow far from the band head.
 */
export function scaledErfc(z: number): number {
  if (!(z >= 0)) {
    throw new RangeError(`scaledErfc needs z ≥ 0, got ${z}`);
  }
  const t = 1 / (1 + 0.5 * z);
  const polynomial =
    -1.26551223 +
    t *
      (1.00002368 +
        t *
          (0.37409196 +
            t *
              (0.09678418 +
                t *
                  (-0.18628806 +
                    t *
                      (0.27886807 +
                        t *
                          (-1.13520398 +
                            t * (1.48851587 + t * (-0.82215223 + t * 0.17087277))))))));
  return t * Math.exp(polynomial);
}
