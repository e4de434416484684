// A small seeded pseudo-random source so synthetic spectra and tests are reproducible run to run.

/** Uniform, normal and Poisson draws from one seeded stream. */
export interface SeededRandom {
  /** A uniform draw in [0, 1). */
  uniform(): number;
  /** A standard normal draw (mean 0, standard deviation 1). */
  normal(): number;
  /** A Poisson draw with the given mean (mean ≥ 0). */
  poisson(mean: number): number;
}

/**
 * A seeded generator: mulberry32 for uniforms (32-bit state, fast, good enough for test data,
 * not for cryptography), Box–Muller for normals, Knuth's product method for small Poisson means
 * and a rounded normal approximation above 30, where the two distributions agree closely.
 * @param seed - any finite number; its low 32 bits seed the stream
 */
export function makeRandom(seed: number): SeededRandom {
  if (!Number.isFinite(seed)) {
    throw new RangeError(`seed must be a finite number, got ${seed}`);
  }
  let state = seed >>> 0;
  let spareNormal: number | null = null;

  function uniform(): number {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  function normal(): number {
    if (spareNormal !== null) {
      const value = spareNormal;
      spareNormal = null;
      return value;
    }
    // 1 − u keeps the logarithm's argument in (0, 1].
    const radius = Math.sqrt(-2 * Math.log(1 - uniform()));
    const angle = 2 * Math.PI * uniform();
    spareNormal = radius * Math.sin(angle);
    return radius * Math.cos(angle);
  }

  function poisson(mean: number): number {
    if (!(mean >= 0) || !Number.isFinite(mean)) {
      throw new RangeError(`Poisson mean must be finite and ≥ 0, got ${mean}`);
    }
    if (mean === 0) return 0;
    if (mean > 30) {
      return Math.max(0, Math.round(mean + Math.sqrt(mean) * normal()));
    }
    const limit = Math.exp(-mean);
    let count = 0;
    let product = uniform();
    while (product > limit) {
      count++;
      product *= uniform();
    }
    return count;
  }

  return { uniform, normal, poisson };
}
