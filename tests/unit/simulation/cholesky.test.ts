import fc from 'fast-check';
import { describe, expect, it } from 'vitest';

import { checkCorrelationMatrix, cholesky, correlationOf, prepareScenario, parseScenario, pathLogReturns, symmetricEigenvalues } from './engineImports';
import type { ScenarioInput } from '@/simulation';
import { baseScenario } from './helpers';

function multiplyLLt(l: number[][]): number[][] {
  const n = l.length;
  return l.map((_, i) => l.map((__, j) => l[i].reduce((s, _v, k) => s + l[i][k] * l[j][k], 0)).slice(0, n));
}

describe('Cholesky factor', () => {
  it('of [[1,2],[2,5]] is [[1,0],[2,1]]', () => {
    // numpy.linalg.cholesky documentation example (real form of the documented [[1,-2j],[2j,5]]).
    expect(cholesky([[1, 2], [2, 5]])).toEqual([[1, 0], [2, 1]]);
  });

  it('reproduces random correlation matrices (L·Lᵀ = C) built as Gram matrices', () => {
    fc.assert(
      fc.property(fc.array(fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 4, maxLength: 4 }), { minLength: 2, maxLength: 4 }), (rows) => {
        const shifted = rows.map((r, i) => r.map((x, k) => (k === i ? x + 1.5 : x)));
        const norms = shifted.map((r) => Math.sqrt(r.reduce((s, x) => s + x * x, 0)));
        const unit = shifted.map((r, i) => r.map((x) => x / norms[i]));
        const c = unit.map((a) => unit.map((b) => a.reduce((s, x, k) => s + x * b[k], 0)));
        for (let i = 0; i < c.length; i++) c[i][i] = 1;
        const back = multiplyLLt(cholesky(c));
        for (let i = 0; i < c.length; i++) for (let j = 0; j < c.length; j++) expect(Math.abs(back[i][j] - c[i][j])).toBeLessThan(1e-7);
      }),
      { numRuns: 60 },
    );
  });

  it('accepts a singular matrix (two funds perfectly correlated)', () => {
    const l = cholesky([[1, 1], [1, 1]]);
    expect(l).toEqual([[1, 0], [1, 0]]);
    expect(checkCorrelationMatrix([[1, 1], [1, 1]])).toEqual([]);
  });
});

describe('correlation matrix checks', () => {
  it('finds eigenvalues 1 and 3 for [[2,1],[1,2]] and 1 − ρ, 1 + 2ρ for equicorrelation', () => {
    // Eigenvalues of [[a,b],[b,a]] are a ± b; an n×n equicorrelation matrix has 1 + (n−1)ρ once and 1 − ρ (n−1 times) — standard linear algebra results.
    const e = symmetricEigenvalues([[2, 1], [1, 2]]);
    expect(e[0]).toBeCloseTo(1, 12);
    expect(e[1]).toBeCloseTo(3, 12);
    const r = 0.4;
    const e3 = symmetricEigenvalues([[1, r, r], [r, 1, r], [r, r, 1]]);
    expect(e3[0]).toBeCloseTo(1 - r, 12);
    expect(e3[1]).toBeCloseTo(1 - r, 12);
    expect(e3[2]).toBeCloseTo(1 + 2 * r, 12);
  });

  it('names the entry that breaks symmetry or the unit diagonal, and the negative eigenvalue', () => {
    expect(checkCorrelationMatrix([[1, 0.5], [0.4, 1]])).toEqual([
      { path: [0, 1], message: expect.stringContaining('not symmetric') },
    ]);
    expect(checkCorrelationMatrix([[1, 0], [0, 0.9]])).toEqual([{ path: [1, 1], message: expect.stringContaining('diagonal') }]);
    expect(checkCorrelationMatrix([[1, 1.2], [1.2, 1]])[0].path).toEqual([0, 1]);
    const psd = checkCorrelationMatrix([[1, 0.9, -0.9], [0.9, 1, 0.9], [-0.9, 0.9, 1]]);
    expect(psd).toHaveLength(1);
    expect(psd[0].path).toEqual([]);
    // Smallest eigenvalue of this matrix is −0.8 (1 − 0.9 − 0.9 along (1, −1, 1)/√3).
    expect(psd[0].message).toMatch(/eigenvalue is -0\.800000/);
    expect(checkCorrelationMatrix([[1, 0], [0]])[0].path).toEqual([1]);
  });
});

describe.each([1, 2])('correlated draws (format %i)', (version) => {
  it('have sample correlations matching the input within sampling error', () => {
    const target = [
      [1, 0.6, -0.3],
      [0.6, 1, 0.2],
      [-0.3, 0.2, 1],
    ];
    const prepared = prepareScenario(parseScenario({ ...baseScenario({ correlations: target, paths: 1000 }), version } as ScenarioInput));
    const F = 3;
    const xs: number[][] = [[], [], []];
    for (let p = 0; p < 1000; p++) {
      const x = pathLogReturns(prepared, p);
      for (let k = 0; k < x.length; k++) xs[k % F].push(x[k]);
    }
    const n = xs[0].length;
    for (let i = 0; i < F; i++) {
      for (let j = i + 1; j < F; j++) {
        const r = correlationOf(xs[i], xs[j]);
        // Large-sample standard error of a sample correlation, (1 − ρ²)/√n (Fisher, 1915; normal data).
        const se = (1 - target[i][j] ** 2) / Math.sqrt(n);
        expect(Math.abs(r - target[i][j]), `ρ[${i}][${j}]: computed ${r}, expected ${target[i][j]}, tolerance ${4 * se}`).toBeLessThan(4 * se);
      }
    }
  });
});
