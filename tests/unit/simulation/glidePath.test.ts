import fc from 'fast-check';
import { describe, expect, it } from 'vitest';

import { weightsAt, type GlidePoint } from '@/simulation';

const ids = ['eq', 'bd', 'cs'];
const path: GlidePoint[] = [
  { yearsToRetirement: 0, weights: { eq: 0.2, bd: 0.3, cs: 0.5 } },
  { yearsToRetirement: 10, weights: { eq: 0.8, bd: 0.2 } },
];

describe('glide path interpolation', () => {
  it('interpolates linearly between points and holds the ends', () => {
    expect(Array.from(weightsAt(path, ids, 5))).toEqual([0.5, 0.25, 0.25]);
    expect(Array.from(weightsAt(path, ids, 7.5)).map((x) => +x.toFixed(12))).toEqual([0.65, 0.225, 0.125]);
    expect(Array.from(weightsAt(path, ids, 30))).toEqual([0.8, 0.2, 0]);
    expect(Array.from(weightsAt(path, ids, 10))).toEqual([0.8, 0.2, 0]);
    expect(Array.from(weightsAt(path, ids, 0))).toEqual([0.2, 0.3, 0.5]);
  });

  it('treats a single point as a fixed mix', () => {
    const fixed: GlidePoint[] = [{ yearsToRetirement: 3, weights: { bd: 1 } }];
    for (const t of [0, 3, 40]) expect(Array.from(weightsAt(fixed, ids, t))).toEqual([0, 1, 0]);
  });

  it('always gives weights that sum to one', () => {
    const point = fc
      .record({ t: fc.integer({ min: 0, max: 45 }), raw: fc.array(fc.integer({ min: 0, max: 1000 }), { minLength: 3, maxLength: 3 }) })
      .filter((p) => p.raw.some((x) => x > 0))
      .map(({ t, raw }) => {
        const total = raw.reduce((a, b) => a + b, 0);
        return { yearsToRetirement: t, weights: Object.fromEntries(ids.map((id, i) => [id, raw[i] / total])) };
      });
    fc.assert(
      fc.property(fc.uniqueArray(point, { minLength: 1, maxLength: 6, selector: (p) => p.yearsToRetirement }), fc.double({ min: 0, max: 60, noNaN: true }), (points, t) => {
        const w = weightsAt(points, ids, t);
        const sum = w.reduce((a, b) => a + b, 0);
        expect(Math.abs(sum - 1), `sum ${sum}`).toBeLessThan(1e-12);
        for (const x of w) expect(x).toBeGreaterThanOrEqual(0);
      }),
    );
  });
});
