import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { rebalance } from '../../components/glideWeights';
import { WEIGHT_SUM_TOLERANCE } from '../../simulation';

const FUNDS = ['a', 'b', 'c', 'd'];
const sum = (w: Record<string, number>) => Object.values(w).reduce((s, x) => s + x, 0);

describe('rebalancing a glide-path point in the editor', () => {
  it('moves the other weights in proportion', () => {
    const w = rebalance({ a: 0.5, b: 0.3, c: 0.2 }, FUNDS, 'a', 0.7);
    expect(w.a).toBe(0.7);
    expect(w.b).toBeCloseTo(0.18, 12); // 0.3/0.5 of the remaining 0.3
    expect(w.c).toBeCloseTo(0.12, 12);
    expect(w.d).toBeUndefined();
  });

  it('gives the remainder to the next fund when the others hold nothing', () => {
    expect(rebalance({ b: 1 }, FUNDS, 'b', 0.6)).toEqual({ b: 0.6, c: expect.closeTo(0.4, 12) });
    expect(rebalance({ d: 1 }, FUNDS, 'd', 0.25)).toEqual({ d: 0.25, a: expect.closeTo(0.75, 12) });
  });

  it('always sums to 1 within the engine tolerance, with no negative weight (property)', () => {
    const weights = fc
      .array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 4, maxLength: 4 })
      .filter((xs) => xs.reduce((s, x) => s + x, 0) > 1e-6)
      .map((xs) => {
        const t = xs.reduce((s, x) => s + x, 0);
        return Object.fromEntries(FUNDS.map((f, i) => [f, xs[i] / t]));
      });
    fc.assert(
      fc.property(weights, fc.constantFrom(...FUNDS), fc.double({ min: -0.5, max: 1.5, noNaN: true }), (w, id, v) => {
        const out = rebalance(w, FUNDS, id, v);
        expect(Math.abs(sum(out) - 1)).toBeLessThanOrEqual(WEIGHT_SUM_TOLERANCE);
        expect(Object.values(out).every((x) => x >= 0)).toBe(true);
        expect(out[id] ?? 0).toBeCloseTo(Math.min(1, Math.max(0, v)), 12);
      }),
    );
  });
});
