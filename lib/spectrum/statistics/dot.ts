// The dot product of two equally long vectors, for normal equations built by hand.

/** Σ aᵢ·bᵢ over the length of `a`. */
export function dot(a: readonly number[], b: readonly number[]): number {
  let sum = 0;
  for (let i = 0; i < a.length; i++) sum += a[i] * b[i];
  return sum;
}
