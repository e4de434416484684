// Brent's minimisation on a bracket: golden-section steps made safe, parabolic steps taken where the
// function allows (R. P. Brent, Algorithms for Minimization without Derivatives, 1973, ch. 5; the same
// method as Forsythe, Malcolm & Moler's fmin and SciPy's fminbound, cited from memory).

const GOLDEN = (3 - Math.sqrt(5)) / 2;
/** √ε of doubles: closer than this, relative to x, a smooth function's values no longer tell points apart. */
const SQRT_EPSILON = Math.sqrt(Number.EPSILON);

/**
 * Where `f` is least on [low, high], to within `tolerance` plus √ε relative to the answer. `f` must have
 * one minimum on the bracket (a scan that brackets it comes first where it may have more). A smooth
 * minimum takes a dozen or so evaluations, where golden-section search takes one per 0.48 of the
 * bracket's logarithm (forty to narrow 0.02 to 10⁻¹⁰).
 */
export function brentMinimum(
  f: (x: number) => number,
  low: number,
  high: number,
  tolerance: number,
): number {
  if (!(tolerance > 0)) throw new RangeError(`tolerance must be positive, got ${tolerance}`);
  if (!(high > low)) throw new RangeError(`the bracket must be [low, high] with low < high`);
  let a = low;
  let b = high;
  // x: the least value so far; w: the second least; v: the previous w.
  let x = a + GOLDEN * (b - a);
  let w = x;
  let v = x;
  let fx = f(x);
  let fw = fx;
  let fv = fx;
  let step = 0;
  let lastStep = 0;
  for (let iteration = 0; iteration < 500; iteration++) {
    const middle = (a + b) / 2;
    const tol1 = SQRT_EPSILON * Math.abs(x) + tolerance / 3;
    const tol2 = 2 * tol1;
    if (Math.abs(x - middle) <= tol2 - (b - a) / 2) break;
    let golden = true;
    if (Math.abs(lastStep) > tol1) {
      // A parabola through x, w and v.
      const r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      else q = -q;
      const previous = lastStep;
      // Taken only when it falls inside the bracket and moves less than half the step before last.
      if (Math.abs(p) < Math.abs(0.5 * q * previous) && p > q * (a - x) && p < q * (b - x)) {
        lastStep = step;
        step = p / q;
        const u = x + step;
        if (u - a < tol2 || b - u < tol2) step = x < middle ? tol1 : -tol1;
        golden = false;
      }
    }
    if (golden) {
      lastStep = x < middle ? b - x : a - x;
      step = GOLDEN * lastStep;
    }
    const u = Math.abs(step) >= tol1 ? x + step : x + (step > 0 ? tol1 : -tol1);
    const fu = f(u);
    if (fu <= fx) {
      if (u < x) b = x;
      else a = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return x;
}
