import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';

import { createStream, streamSeed } from '@/simulation';

describe('random streams', () => {
  it('are seedrandom’s Alea seeded from (seed, stream index)', () => {
    const stream = createStream(42, 7);
    const reference = seedrandom.alea(streamSeed(42, 7));
    for (let i = 0; i < 100; i++) expect(stream.next()).toBe(reference());
  });

  it('repeat after save/restore and differ between stream indices and seeds', () => {
    const a = createStream(1, 0);
    for (let i = 0; i < 10; i++) a.next();
    const saved = a.save();
    const first = Array.from({ length: 20 }, () => a.next());
    a.restore(saved);
    const again = Array.from({ length: 20 }, () => a.next());
    expect(again).toEqual(first);
    const b = createStream(1, 1);
    const c = createStream(2, 0);
    const d = createStream(1, 0);
    const xs = Array.from({ length: 20 }, () => [b.next(), c.next(), d.next()]);
    expect(xs.map((x) => x[0])).not.toEqual(xs.map((x) => x[2]));
    expect(xs.map((x) => x[1])).not.toEqual(xs.map((x) => x[2]));
  });

  it('give uniforms with mean 1/2 and variance 1/12 within sampling error', () => {
    // Uniform(0,1): mean 1/2, variance 1/12; the standard error of the mean is √(1/12/n).
    const n = 100000;
    const s = createStream(99, 3);
    let sum = 0;
    let sumSq = 0;
    for (let i = 0; i < n; i++) {
      const u = s.next();
      expect(u >= 0 && u < 1).toBe(true);
      sum += u;
      sumSq += u * u;
    }
    const mean = sum / n;
    const variance = sumSq / n - mean * mean;
    const se = Math.sqrt(1 / 12 / n);
    expect(Math.abs(mean - 0.5), `mean ${mean}, tolerance ${4 * se}`).toBeLessThan(4 * se);
    // Standard error of the sample variance √((μ₄ − σ⁴)/n), with μ₄ = 1/80 for U(0,1) (from memory).
    const seVariance = Math.sqrt((1 / 80 - 1 / 144) / n);
    expect(Math.abs(variance - 1 / 12), `variance ${variance}, tolerance ${4 * seVariance}`).toBeLessThan(4 * seVariance);
  });
});
