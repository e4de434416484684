// Checks the block sums and counts and the strongest-first walk against plain loops over the values.
import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { buildMaxTree } from "../../../../lib/spectrum/matching/build-max-tree";
import { buildSortedBlocks } from "../../../../lib/spectrum/matching/build-sorted-blocks";
import { countAtLeast } from "../../../../lib/spectrum/matching/count-at-least";
import { sumAtLeast } from "../../../../lib/spectrum/matching/sum-at-least";
import { walkStrongestFirst } from "../../../../lib/spectrum/matching/walk-strongest-first";

/** Values in [0, 1] with NaN ("no value") and repeats, a block size, a range and a threshold. */
const caseArbitrary = fc
  .record({
    values: fc.array(
      fc.oneof(
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.constant(NaN),
        fc.constantFrom(0, 0.25, 0.5, 1),
      ),
      { maxLength: 300 },
    ),
    blockSize: fc.integer({ min: 1, max: 40 }),
    a: fc.nat(),
    b: fc.nat(),
    threshold: fc.oneof(
      fc.double({ min: 0, max: 1.1, noNaN: true }),
      fc.constantFrom(0, 0.25, 0.5),
    ),
  })
  .map(({ values, blockSize, a, b, threshold }) => {
    const n = values.length;
    const from = n === 0 ? 0 : a % (n + 1);
    const to = from + (n === 0 ? 0 : b % (n + 1 - from));
    return { values: Float64Array.from(values), blockSize, from, to, threshold };
  });

describe("sumAtLeast and countAtLeast on buildSortedBlocks", () => {
  it("give the count exactly and the sum to 1e-12 of a plain loop over the range", () => {
    fc.assert(
      fc.property(caseArbitrary, ({ values, blockSize, from, to, threshold }) => {
        const blocks = buildSortedBlocks(values, { blockSize });
        let count = 0;
        let sum = 0;
        for (let p = from; p < to; p++) {
          if (values[p] >= threshold) {
            count++;
            sum += values[p];
          }
        }
        expect(countAtLeast(blocks, from, to, threshold)).toBe(count);
        // Block order changes only the rounding: at most ~n ulps of values ≤ 1.
        expect(Math.abs(sumAtLeast(blocks, from, to, threshold) - sum)).toBeLessThanOrEqual(1e-12);
      }),
      { numRuns: 400 },
    );
  });

  it("leave the values unchanged and refuse a block size below 1", () => {
    const values = Float64Array.of(0.3, NaN, 0.9, 0.1);
    buildSortedBlocks(values, { blockSize: 2 });
    expect(Array.from(values)).toEqual([0.3, NaN, 0.9, 0.1]);
    expect(() => buildSortedBlocks(values, { blockSize: 0 })).toThrow(RangeError);
  });
});

describe("walkStrongestFirst on a buildMaxTree", () => {
  it("visits the positions at or above the threshold by value descending, then position", () => {
    fc.assert(
      fc.property(
        caseArbitrary,
        fc.nat({ max: 30 }),
        ({ values, from, to, threshold }, stopAfter) => {
          const expected: number[] = [];
          for (let p = from; p < to; p++) if (values[p] >= threshold) expected.push(p);
          expected.sort((a, b) => values[b] - values[a] || a - b);
          const visited: number[] = [];
          walkStrongestFirst(buildMaxTree(values), from, to, threshold, (p) => {
            visited.push(p);
            return visited.length < stopAfter;
          });
          expect(visited).toEqual(
            expected.slice(0, Math.max(1, stopAfter)).slice(0, expected.length),
          );
        },
      ),
      { numRuns: 400 },
    );
  });
});
