import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';

import {
  fastExp,
  spreadGrowth,
  spreadGrowthExact,
  Xoshiro128,
  ZIGGURAT_LAYERS,
  ZIGGURAT_R,
  ZIGGURAT_V,
  ZIGGURAT_X,
  zigguratNormal,
} from '@/simulation';
import { zigguratNormals } from '@/simulation/ziggurat';

/** Normals as the engine draws them: `perSet` from each of `sets` draw-set streams. */
function engineNormals(seed: number, sets: number, perSet: number): Float64Array {
  const out = new Float64Array(sets * perSet);
  const g = new Xoshiro128();
  for (let s = 0; s < sets; s++) zigguratNormals(g.seed(seed, s), out, perSet, s * perSet, 1);
  return out;
}

describe('format-2 random numbers', () => {
  it('ziggurat tables: every layer has the same area v and the top layer closes at 0', () => {
    // f(x) = exp(−x²/2); base strip plus tail: r·f(r) + ∫_r^∞ f = v, the tail from jstat's normal cdf
    // (∫_r^∞ f = √(2π)(1 − Φ(r))). Published 256-layer constants (Marsaglia & Tsang, 2000): r ≈ 3.6541528853610088, v ≈ 4.92867323399e-3 (from memory).
    const f = (x: number) => Math.exp(-0.5 * x * x);
    const tail = Math.sqrt(2 * Math.PI) * (1 - jStat.normal.cdf(ZIGGURAT_R, 0, 1));
    expect(Math.abs(ZIGGURAT_R * f(ZIGGURAT_R) + tail - ZIGGURAT_V) / ZIGGURAT_V).toBeLessThan(1e-9);
    expect(Math.abs(ZIGGURAT_R - 3.6541528853610088)).toBeLessThan(1e-12);
    expect(Math.abs(ZIGGURAT_V - 4.92867323399e-3)).toBeLessThan(1e-12);
    for (let i = 1; i < ZIGGURAT_LAYERS; i++) {
      const area = ZIGGURAT_X[i] * (f(ZIGGURAT_X[i + 1]) - f(ZIGGURAT_X[i]));
      expect(Math.abs(area - ZIGGURAT_V) / ZIGGURAT_V, `layer ${i}`).toBeLessThan(1e-9);
    }
    expect(ZIGGURAT_X[ZIGGURAT_LAYERS]).toBe(0);
  });

  it('passes a Kolmogorov–Smirnov test against the standard normal (jstat) at 1,000,000 draws', () => {
    const z = engineNormals(20260411, 10000, 100).sort();
    const n = z.length;
    let d = 0;
    for (let i = 0; i < n; i++) {
      const cdf = jStat.normal.cdf(z[i], 0, 1);
      d = Math.max(d, (i + 1) / n - cdf, cdf - i / n);
    }
    // Asymptotic critical value of √n·D at the 1 % level: 1.628 (Kolmogorov distribution; from memory).
    const critical = 1.628 / Math.sqrt(n);
    expect(d, `D = ${d}, 1 % critical value ${critical}`).toBeLessThan(critical);
  });

  it('has lag-1 and cross-stream correlations within 3 standard errors of 0', () => {
    const sets = 10000;
    const perSet = 100;
    const z = engineNormals(77, sets, perSet);
    // Sample correlation of independent normals has standard error about 1/√n (Fisher, 1915).
    const corr = (n: number, x: (i: number) => number, y: (i: number) => number) => {
      let sx = 0;
      let sy = 0;
      let sxx = 0;
      let syy = 0;
      let sxy = 0;
      for (let i = 0; i < n; i++) {
        const a = x(i);
        const b = y(i);
        sx += a;
        sy += b;
        sxx += a * a;
        syy += b * b;
        sxy += a * b;
      }
      return { r: (sxy - (sx * sy) / n) / Math.sqrt((sxx - (sx * sx) / n) * (syy - (sy * sy) / n)), tolerance: 3 / Math.sqrt(n) };
    };
    // Lag 1 inside each stream: element k and k + 1 of the same draw set.
    const perLag = perSet - 1;
    const lag = corr(sets * perLag, (i) => z[Math.floor(i / perLag) * perSet + (i % perLag)], (i) => z[Math.floor(i / perLag) * perSet + (i % perLag) + 1]);
    // Neighbouring streams: element k of draw sets s and s + 1.
    const cross = corr((sets - 1) * perSet, (i) => z[i], (i) => z[i + perSet]);
    // Streams of nearby seeds.
    const other = engineNormals(78, sets, perSet);
    const seeds = corr(z.length, (i) => z[i], (i) => other[i]);
    for (const [label, c] of [['lag 1', lag], ['neighbouring streams', cross], ['neighbouring seeds', seeds]] as const) {
      expect(Math.abs(c.r), `${label}: r = ${c.r}, tolerance ${c.tolerance}`).toBeLessThan(c.tolerance);
    }
  });

  it('gives the same numbers one at a time and in bulk, and depends only on (seed, draw set)', () => {
    const a = new Xoshiro128().seed(-123456789012, 41);
    const b = new Xoshiro128().seed(-123456789012, 41);
    const bulk = new Float64Array(5000);
    zigguratNormals(a, bulk, 5000);
    for (let k = 0; k < 5000; k++) expect(zigguratNormal(b)).toBe(bulk[k]);
    expect(a.save()).toEqual(b.save());
    const saved = a.save();
    const next = [a.nextInt(), a.nextInt()];
    a.restore(saved);
    expect([a.nextInt(), a.nextInt()]).toEqual(next);
    // Every draw set of a run starts from a different state.
    const states = new Set<string>();
    for (let s = 0; s < 20000; s++) states.add(new Xoshiro128().seed(5, s).save().join(','));
    expect(states.size).toBe(20000);
  });

  it('fastExp agrees with Math.exp to 1e-15 relative', () => {
    let worst = 0;
    for (let k = 0; k <= 200000; k++) {
      const x = -30 + (60 * k) / 200000 + 1e-7 * Math.sin(k);
      worst = Math.max(worst, Math.abs(fastExp(x) / Math.exp(x) - 1));
    }
    expect(worst).toBeLessThan(1e-15);
    expect(fastExp(0)).toBe(1);
    expect(fastExp(800)).toBe(Infinity);
  });

  it('spreadGrowth is (1/12) Σ q^(k/12) to 1e-11 (table) and 1e-14 (exact), and equals i / i⁽¹²⁾', () => {
    for (let q = 0.05; q < 6; q += 0.000731) {
      const direct = Array.from({ length: 12 }, (_, k) => q ** (k / 12)).reduce((a, b) => a + b, 0) / 12;
      expect(Math.abs(spreadGrowth(q) / direct - 1), `q = ${q}`).toBeLessThan(1e-11);
      expect(Math.abs(spreadGrowthExact(q) / direct - 1)).toBeLessThan(1e-14);
      // i/i⁽¹²⁾ with i⁽¹²⁾ = 12((1 + i)^(1/12) − 1): the standard actuarial relation (from memory);
      // near q = 1 the closed form itself loses digits to cancellation, hence 1e-10.
      const i = q - 1;
      if (Math.abs(i) > 1e-3) expect(Math.abs(spreadGrowthExact(q) / (i / (12 * (q ** (1 / 12) - 1))) - 1)).toBeLessThan(1e-10);
    }
  });
});
