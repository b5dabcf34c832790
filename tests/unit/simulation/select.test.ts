import fc from 'fast-check';
import { describe, expect, it } from 'vitest';

import { percentileOfSelected, percentileRanks, selectInPlace, selectManyInPlace } from '@/simulation';
import { float32ValuesAtRanks, float64ValuesAtRanks, percentileFromRanks } from '@/simulation/select';
import { percentileOfSorted } from '@/simulation/statistics';

describe('selection instead of sorting', () => {
  it('places every asked rank as a full sort would, and gives the same percentiles', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 3000 }),
        fc.uniqueArray(fc.double({ min: 0.1, max: 99.9, noNaN: true }), { minLength: 1, maxLength: 9 }),
        fc.boolean(),
        (raw, percentiles, single) => {
          // −0 and +0 compare equal, so selection may return either where a sort puts −0 first (pots are never −0).
          const values = raw.map((v) => (Math.fround(v) === 0 ? 0 : v));
          const sorted = Float64Array.from(values).sort();
          const a = Float64Array.from(values);
          const b = Float32Array.from(values);
          const ranks = percentileRanks(a.length, percentiles);
          selectManyInPlace(a, ranks);
          selectManyInPlace(b, ranks);
          const sorted32 = Float32Array.from(values).sort();
          for (const r of ranks) {
            expect(a[r]).toBe(sorted[r]);
            expect(b[r]).toBe(sorted32[r]);
          }
          for (const p of percentiles) {
            expect(percentileOfSelected(a, p)).toBe(percentileOfSorted(sorted, p));
            expect(percentileOfSelected(b, p)).toBe(percentileOfSorted(sorted32, p));
          }
          if (single) {
            const k = Math.floor(values.length / 3);
            const c = Float64Array.from(values);
            selectInPlace(c, k);
            for (let i = 0; i < c.length; i++) expect(i < k ? c[i] <= c[k] : c[i] >= c[k]).toBe(true);
          }
        },
      ),
      { numRuns: 200 },
    );
  });

  it('radix selection on float32 bit patterns gives the same order statistics and percentiles as a sort', () => {
    fc.assert(
      fc.property(
        fc.array(fc.oneof(fc.float({ min: 0, max: 1e7, noNaN: true }), fc.constantFrom(0, 1, 2.5, 1e-30, 3e38)), { minLength: 1, maxLength: 4000 }),
        fc.uniqueArray(fc.double({ min: 0.1, max: 99.9, noNaN: true }), { minLength: 1, maxLength: 9 }),
        fc.boolean(),
        (raw, percentiles, negative) => {
          const values = Float32Array.from(raw.map((v) => (v === 0 ? 0 : v)));
          if (negative) values[0] = -1; // falls back to selection
          const sorted = values.slice().sort();
          const ranks = percentileRanks(values.length, percentiles);
          const before = values.slice();
          const at = float32ValuesAtRanks(values, ranks);
          ranks.forEach((r, k) => expect(at[k]).toBe(sorted[r]));
          for (const p of percentiles) expect(percentileFromRanks(values.length, p, ranks, at)).toBe(percentileOfSorted(sorted, p));
          expect(values).toEqual(before); // not moved
          // Float64 values bucketed by their float32 rounding: exact values at the ranks.
          const doubles = Float64Array.from(raw.map((v, i) => (v === 0 ? 0 : v * (1 + 1e-12 * (i % 7)))));
          if (negative) doubles[0] = -1;
          const sortedDoubles = doubles.slice().sort();
          const at64 = float64ValuesAtRanks(doubles, ranks);
          ranks.forEach((r, k) => expect(at64[k]).toBe(sortedDoubles[r]));
        },
      ),
      { numRuns: 150 },
    );
  });

  it('handles large ranges (Floyd–Rivest sampling) and many ties', () => {
    const n = 50001;
    const values = Float64Array.from({ length: n }, (_, i) => ((i * 7919) % 1000) / 10);
    const sorted = values.slice().sort();
    const ranks = percentileRanks(n, [1, 5, 50, 95, 99]);
    selectManyInPlace(values, ranks);
    for (const r of ranks) expect(values[r]).toBe(sorted[r]);
  });
});
