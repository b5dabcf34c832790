import { standardNormalQuantile } from './normal';
import type { PreparedScenario } from './prepare';
import { createStream, PATHS_PER_STREAM, toOpenUnit, type RandomStream } from './random';

/**
 * The path loop.
 *
 * For each path p:
 * 1. Draw set k = p (or ⌊p/2⌋ with antithetic variates; odd paths negate the normals) is
 *    read from stream ⌊k / 256⌋ at offset (k mod 256) × maxYears × funds (see random.ts):
 *    one uniform u per fund per year, z = Φ⁻¹(u).
 * 2. Year y, fund i: X = μᵢ + σᵢ (L z_y)ᵢ with L the Cholesky factor of the correlations,
 *    gross return 1 + Rᵢ = exp(X). These draws are shared by every option and member
 *    (common random numbers; year y is the y-th year from now for every member).
 * 3. For each (option, member) pair, year y = 0 … n−1 with weights w and charge c for
 *    n − y years to retirement: 1 + R = Σ wᵢ(1 + Rᵢ) (rebalanced each year), and
 *    pot ← (pot + contribution_y) × (1 + R) × (1 − c). In the stress year the stressed
 *    fund's gross return is 1 − fall instead.
 *
 * Output per pair, for paths [start, end): the nominal pot at the end of years 0 … n−2
 * (Float32, age-major: [y × len + j]) and at retirement (Float64). Nothing is allocated
 * inside the path loop apart from one generator per 256 paths.
 *
 * Every path's numbers depend only on (seed, path index, scenario), so any split of the
 * paths into ranges, computed anywhere, concatenates to the same arrays.
 */
export interface PairChunk {
  pairIndex: number;
  /** First path of the chunk. */
  start: number;
  /** Number of paths. */
  length: number;
  /** Nominal pot after year y (y = 0 … n−2) for path start + j at [y × length + j]. */
  bands: Float32Array;
  /** Nominal pot at retirement for path start + j. */
  terminal: Float64Array;
}

export interface SimulateOptions {
  /** Called with the fraction of this range done (0 … 1), about every 256 paths. */
  onProgress?: (fractionDone: number) => void;
}

/** Simulate paths [start, end) for the given pairs (indices into prepared.pairs). */
export function simulateRange(
  prepared: PreparedScenario,
  start: number,
  end: number,
  pairIndices: readonly number[],
  options: SimulateOptions = {},
): PairChunk[] {
  const { scenario, fundCount: F, maxYears: Y, mu, sigma, chol, stressFund, stressGross } = prepared;
  const D = Y * F;
  const length = Math.max(0, end - start);
  const antithetic = scenario.antithetic;
  const pairs = pairIndices.map((i) => prepared.pairs[i]);
  const chunks: PairChunk[] = pairs.map((pair) => ({
    pairIndex: pair.pairIndex,
    start,
    length,
    bands: new Float32Array(Math.max(pair.years - 1, 0) * length),
    terminal: new Float64Array(length),
  }));
  const P = pairs.length;
  const normals = new Float64Array(D);
  const gross = new Float64Array(D);
  const correlated = new Float64Array(F);
  let streamIndex = Math.floor((antithetic ? Math.floor(start / 2) : start) / PATHS_PER_STREAM);
  let stream: RandomStream = createStream(scenario.seed, streamIndex);
  let next = stream.next;
  let position = 0; // draw sets consumed from the current stream
  let heldSet = -1; // draw set currently in `normals`
  const progressEvery = 256;
  // Imported bindings are read once: compiled CommonJS turns each use into a property read.
  const quantile = standardNormalQuantile;
  const openUnit = toOpenUnit;
  const perStream = PATHS_PER_STREAM;
  const newStream = createStream;

  for (let p = start; p < end; p++) {
    const j = p - start;
    const drawSet = antithetic ? Math.floor(p / 2) : p;
    const sign = antithetic && p % 2 === 1 ? -1 : 1;
    if (drawSet !== heldSet) {
      const block = Math.floor(drawSet / perStream);
      const offset = drawSet - block * perStream;
      if (block !== streamIndex || offset < position) {
        stream = newStream(scenario.seed, block);
        next = stream.next;
        streamIndex = block;
        position = 0;
      }
      for (let skip = (offset - position) * D; skip > 0; skip--) next();
      for (let k = 0; k < D; k++) normals[k] = quantile(openUnit(next()));
      position = offset + 1;
      heldSet = drawSet;
    }
    // Correlate and exponentiate.
    for (let y = 0; y < Y; y++) {
      const base = y * F;
      for (let i = 0; i < F; i++) {
        let s = 0;
        const row = i * F;
        for (let k = 0; k <= i; k++) s += chol[row + k] * normals[base + k];
        correlated[i] = s;
      }
      for (let i = 0; i < F; i++) gross[base + i] = Math.exp(mu[i] + sigma[i] * sign * correlated[i]);
    }
    // Accumulate every pair on the same draws.
    for (let q = 0; q < P; q++) {
      const pair = pairs[q];
      const chunk = chunks[q];
      const n = pair.years;
      const w = pair.weights;
      const cf = pair.chargeFactor;
      const contributions = pair.timeline.contributions;
      const bands = chunk.bands;
      const stressYear = pair.stressYear;
      let pot = pair.timeline.initialPot;
      for (let y = 0; y < n; y++) {
        const base = y * F;
        let g = 0;
        for (let i = 0; i < F; i++) g += w[base + i] * gross[base + i];
        if (y === stressYear) g += w[base + stressFund] * (stressGross - gross[base + stressFund]);
        pot = (pot + contributions[y]) * g * cf[y];
        if (y < n - 1) bands[y * length + j] = pot;
      }
      chunk.terminal[j] = pot;
    }
    if (options.onProgress && (j + 1) % progressEvery === 0) options.onProgress((j + 1) / length);
  }
  if (options.onProgress) options.onProgress(1);
  return chunks;
}

/**
 * The fund log returns X (before exponentiation) that path `path` sees, as [year × funds + i].
 * For checks of the draws (moments and correlations); the path loop computes the same values.
 */
export function pathLogReturns(prepared: PreparedScenario, path: number): Float64Array {
  const { fundCount: F, maxYears: Y, mu, sigma, chol, scenario } = prepared;
  const D = Y * F;
  const antithetic = scenario.antithetic;
  const drawSet = antithetic ? Math.floor(path / 2) : path;
  const sign = antithetic && path % 2 === 1 ? -1 : 1;
  const block = Math.floor(drawSet / PATHS_PER_STREAM);
  const stream = createStream(scenario.seed, block);
  for (let skip = (drawSet - block * PATHS_PER_STREAM) * D; skip > 0; skip--) stream.next();
  const z = new Float64Array(D);
  for (let k = 0; k < D; k++) z[k] = standardNormalQuantile(toOpenUnit(stream.next()));
  const out = new Float64Array(D);
  for (let y = 0; y < Y; y++) {
    for (let i = 0; i < F; i++) {
      let s = 0;
      for (let k = 0; k <= i; k++) s += chol[i * F + k] * z[y * F + k];
      out[y * F + i] = mu[i] + sigma[i] * sign * s;
    }
  }
  return out;
}
