import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';

import { standardNormalQuantile } from '@/simulation';

describe('standard normal quantile', () => {
  it('agrees with jstat.normal.inv from 1e-4 to 1 − 1e-4', () => {
    // Reference library: jstat normal.inv; algorithm: Wichura (1988), Applied Statistics AS 241.
    // (jstat's own inverse loses accuracy in the far tails, checked by the cdf round trip below.)
    const ps = [1e-4, 0.001, 0.01, 0.025, 0.05, 0.075, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 0.925, 0.95, 0.975, 0.99, 0.999, 1 - 1e-4];
    for (const p of ps) {
      const computed = standardNormalQuantile(p);
      const expected = jStat.normal.inv(p, 0, 1);
      expect(Math.abs(computed - expected), `p=${p}: ${computed} vs ${expected}`).toBeLessThan(1e-8 * Math.max(1, Math.abs(expected)));
    }
  });

  it('inverts the normal cdf and is odd about 1/2', () => {
    // Reference library: jstat normal.cdf.
    for (let p = 0.0005; p < 1; p += 0.0173) {
      const z = standardNormalQuantile(p);
      expect(Math.abs(jStat.normal.cdf(z, 0, 1) - p), `p=${p}`).toBeLessThan(1e-12);
      expect(Math.abs(z + standardNormalQuantile(1 - p))).toBeLessThan(1e-9);
    }
    for (const p of [1e-7, 1e-6, 1e-5]) {
      const z = standardNormalQuantile(p);
      expect(Math.abs(jStat.normal.cdf(z, 0, 1) / p - 1), `tail p=${p}, z=${z}`).toBeLessThan(1e-6);
    }
    expect(standardNormalQuantile(0)).toBe(-Infinity);
    expect(standardNormalQuantile(1)).toBe(Infinity);
    expect(Number.isNaN(standardNormalQuantile(1.5))).toBe(true);
  });
});
