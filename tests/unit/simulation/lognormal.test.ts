import fc from 'fast-check';
import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';

import { lognormalFromMoments, momentsFromLognormal } from '@/simulation';

describe('moment-matched lognormal returns', () => {
  it('gives mu ≈ 0.0579278 and sigma ≈ 0.1395054 for m = 7%, s = 15%', () => {
    // Aitchison & Brown (1957), The Lognormal Distribution: E = exp(μ+σ²/2), Var = (exp σ² − 1) exp(2μ+σ²).
    const { mu, sigma } = lognormalFromMoments(0.07, 0.15);
    expect(Math.abs(mu - 0.0579278), `mu ${mu} vs 0.0579278`).toBeLessThan(5e-8);
    expect(Math.abs(sigma - 0.1395054), `sigma ${sigma} vs 0.1395054`).toBeLessThan(5e-8);
  });

  it('reproduces the mean and standard deviation through jstat’s lognormal', () => {
    // Reference library: jstat lognormal.mean / lognormal.variance (Aitchison & Brown moments).
    fc.assert(
      fc.property(
        fc.double({ min: -0.5, max: 0.5, noNaN: true }),
        fc.double({ min: 0.001, max: 0.6, noNaN: true }), // jstat’s variance underflows to 0 for σ near 0
        (m, s) => {
          const { mu, sigma } = lognormalFromMoments(m, s);
          const mean = jStat.lognormal.mean(mu, sigma) - 1;
          const sd = Math.sqrt(jStat.lognormal.variance(mu, sigma));
          // jstat computes exp(σ²) − 1 directly, which loses digits for tiny σ: allow 1e-10 absolute.
          expect(Math.abs(mean - m), `mean ${mean} vs ${m}`).toBeLessThan(1e-10 + 1e-12 * Math.abs(m));
          expect(Math.abs(sd - s), `sd ${sd} vs ${s}`).toBeLessThan(1e-10 + 1e-9 * s);
          const back = momentsFromLognormal(mu, sigma);
          expect(Math.abs(back.mean - m)).toBeLessThan(1e-12);
          expect(Math.abs(back.sd - s)).toBeLessThan(1e-12);
        },
      ),
    );
  });

  it('rejects a return of −100% or below and a negative volatility', () => {
    expect(() => lognormalFromMoments(-1, 0.1)).toThrow(/above -1/);
    expect(() => lognormalFromMoments(0.05, -0.1)).toThrow(/volatility/);
  });
});
