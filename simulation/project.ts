import { SPREAD, spreadGrowth, spreadGrowthExact } from './fastMath';
import { marketFor } from './market';
import type { PreparedScenario } from './prepare';

/**
 * The path loop: market once, members many.
 *
 * Paths are taken in blocks of {@link BLOCK_PATHS}. For each block the market step
 * (market.ts) writes every fund's gross return for every year, once; then each (option,
 * member) pair walks over it, paths innermost, year by year:
 *
 *   g = Σᵢ wᵢ(1 + Rᵢ)        (weights held through the year, rebalanced yearly; zero weights skipped)
 *   q = g × (1 − c)           (c = Σᵢ wᵢcᵢ, the blended annual charge)
 *   start-of-year contributions:  pot ← (pot + C) × g × (1 − c)
 *   spread contributions:         pot ← pot × q + C × s(q),   s(q) = (1/12) Σₖ q^(k/12)
 *
 * In the stress year the stressed fund's gross return is 1 − fall. (Format 1 applies it as
 * engine 1 did, g += w_s(1 − fall − (1 + R_s)); format 2 substitutes it.)
 *
 * Output per pair, into a {@link PairStore} covering every path of the run: the nominal pot at
 * the end of years 0 … n−2 (Float32, age-major: [y × paths + p]) and at retirement (Float64).
 * Every path's numbers depend only on (seed, path index, scenario), so any split of the paths
 * into ranges, computed anywhere (another thread writing into shared memory), gives the same
 * arrays. Nothing is allocated inside the path loop.
 */
export const BLOCK_PATHS = 256;

/** Per-pair output arrays over all paths of a run (plain or shared memory). */
export interface PairStore {
  pairIndex: number;
  /** Number of paths (the run's). */
  paths: number;
  /** Nominal pot after year y (y = 0 … n−2) for path p at [y × paths + p]; null when bands are not kept. */
  bands: Float32Array | null;
  /** Nominal pot at retirement for path p; real (÷ the deflator) once the pair is summarised. */
  terminal: Float64Array;
}

export interface StoreOptions {
  /** Allocate on SharedArrayBuffer so worker threads can write into the same arrays. */
  shared?: boolean;
  /** Keep per-age pots for the bands (default true). */
  bands?: boolean;
}

/** Arrays for the given pairs over all paths of the run. */
export function createPairStores(prepared: PreparedScenario, pairIndices: readonly number[], options: StoreOptions = {}): PairStore[] {
  const paths = prepared.scenario.paths;
  const Buffer = options.shared ? SharedArrayBuffer : ArrayBuffer;
  return pairIndices.map((pairIndex) => {
    const years = prepared.pairs[pairIndex].years;
    const bandValues = options.bands === false ? 0 : Math.max(years - 1, 0) * paths;
    return {
      pairIndex,
      paths,
      bands: options.bands === false ? null : new Float32Array(new Buffer(4 * bandValues)),
      terminal: new Float64Array(new Buffer(8 * paths)),
    };
  });
}

export interface SimulateOptions {
  /** Called with the fraction of this range done (0 … 1), about every 1,024 paths. */
  onProgress?: (fractionDone: number) => void;
}

/** Simulate paths [start, end) for the pairs of `stores`, writing into them. */
export function simulateRange(prepared: PreparedScenario, start: number, end: number, stores: readonly PairStore[], options: SimulateOptions = {}): void {
  const F = prepared.fundCount;
  const B = BLOCK_PATHS;
  const gross = new Float64Array(prepared.maxYears * F * B);
  const scratch = createWalkScratch();
  const market = marketFor(prepared);
  const total = Math.max(0, end - start);
  let sinceReport = 0;
  for (let first = start; first < end; first += B) {
    const count = Math.min(B, end - first);
    market.fill(first, count, gross, B);
    for (const store of stores) walkPair(prepared, store, gross, first, count, scratch);
    sinceReport += count;
    if (options.onProgress && sinceReport >= 1024) {
      sinceReport = 0;
      options.onProgress((first + count - start) / total);
    }
  }
  if (options.onProgress) options.onProgress(1);
}

/** Scratch shared by the walks of one range. */
export interface WalkScratch {
  pot: Float64Array;
  acc: Float64Array;
  /** Receives the "band" of the final year, which is not kept (saves a branch per path). */
  sink: Float32Array;
}

export function createWalkScratch(): WalkScratch {
  return { pot: new Float64Array(BLOCK_PATHS), acc: new Float64Array(BLOCK_PATHS), sink: new Float32Array(BLOCK_PATHS) };
}

/**
 * One pair over one block of market paths [first, first + count) laid out as the market step
 * writes them (blocks of BLOCK_PATHS; see the module comment), into the pair's store. Years
 * with at most three funds held are walked in one fused pass (unused terms get weight 0 on the
 * first fund's row, which adds exactly 0); others, and format 1's stress year, one pass per fund.
 */
export function walkPair(prepared: PreparedScenario, store: PairStore, gross: Float64Array, first: number, count: number, scratch: WalkScratch): void {
  const B = BLOCK_PATHS;
  const pair = prepared.pairs[store.pairIndex];
  const formatOne = prepared.scenario.version === 1;
  const spread = prepared.scenario.timing.contributions === 'spread';
  const F = prepared.fundCount;
  const n = pair.years;
  const w = pair.weights;
  const cf = pair.chargeFactor;
  const contributions = pair.timeline.contributions;
  const stressYear = pair.stressYear;
  const stressFund = prepared.stressFund;
  const stressGross = prepared.stressGross;
  const { pot, acc, sink } = scratch;
  const growth = spreadGrowth;
  pot.fill(pair.timeline.initialPot, 0, count);
  for (let y = 0; y < n; y++) {
    const base = y * F;
    const c = contributions[y];
    const charge = cf[y];
    const keep = store.bands !== null && y < n - 1;
    const out = keep ? (store.bands as Float32Array) : sink;
    const offset = keep ? y * store.paths + first : 0;
    // The funds held this year.
    let held = 0;
    let w0 = 0;
    let w1 = 0;
    let w2 = 0;
    let r0 = 0;
    let r1 = 0;
    let r2 = 0;
    for (let i = 0; i < F; i++) {
      const wi = w[base + i];
      if (wi === 0) continue;
      if (held === 0) {
        w0 = wi;
        r0 = r1 = r2 = (base + i) * B;
      } else if (held === 1) {
        w1 = wi;
        r1 = (base + i) * B;
      } else if (held === 2) {
        w2 = wi;
        r2 = (base + i) * B;
      }
      held++;
    }
    if (held <= 3 && y !== stressYear) {
      if (spread) yearSpread(gross, r0, r1, r2, w0, w1, w2, charge, c, pot, out, offset, count);
      else yearStart(gross, r0, r1, r2, w0, w1, w2, charge, c, pot, out, offset, count);
      continue;
    }
    let started = false;
    for (let i = 0; i < F; i++) {
      const wi = w[base + i];
      if (wi === 0) continue;
      if (!formatOne && y === stressYear && i === stressFund) {
        const k = wi * stressGross;
        if (started) for (let j = 0; j < count; j++) acc[j] += k;
        else acc.fill(k, 0, count);
      } else {
        const row = (base + i) * B;
        if (started) for (let j = 0; j < count; j++) acc[j] += wi * gross[row + j];
        else for (let j = 0; j < count; j++) acc[j] = wi * gross[row + j];
      }
      started = true;
    }
    if (formatOne && y === stressYear) {
      // Engine 1's arithmetic, kept so format-1 results stay byte-identical.
      const ws = w[base + stressFund];
      const row = (base + stressFund) * B;
      for (let j = 0; j < count; j++) acc[j] += ws * (stressGross - gross[row + j]);
    }
    if (spread) {
      for (let j = 0; j < count; j++) {
        const q = acc[j] * charge;
        pot[j] = pot[j] * q + c * growth(q);
      }
    } else {
      for (let j = 0; j < count; j++) pot[j] = (pot[j] + c) * acc[j] * charge;
    }
    for (let j = 0; j < count; j++) out[offset + j] = pot[j];
  }
  store.terminal.set(pot.subarray(0, count), first);
}

/**
 * One year of the fused walk, contributions spread through the year: pot ← pot·q + C·s(q),
 * s(q) = spreadGrowth(q) evaluated inline from its table (a call per path would cost more
 * than the rest of the step).
 */
function yearSpread(
  gross: Float64Array,
  r0: number,
  r1: number,
  r2: number,
  w0: number,
  w1: number,
  w2: number,
  charge: number,
  c: number,
  pot: Float64Array,
  out: Float32Array,
  offset: number,
  count: number,
): void {
  const t = SPREAD.table;
  const low = SPREAD.low;
  const high = SPREAD.high;
  const cells = SPREAD.cellsPerUnit;
  const exact = spreadGrowthExact;
  for (let j = 0; j < count; j++) {
    const q = (w0 * gross[r0 + j] + w1 * gross[r1 + j] + w2 * gross[r2 + j]) * charge;
    let s: number;
    if (q >= low && q < high) {
      const u = (q - low) * cells;
      const cell = u | 0;
      const d = u - cell - 0.5;
      const o = cell << 2;
      s = t[o] + t[o + 1] * d + d * d * (t[o + 2] + t[o + 3] * d);
    } else s = exact(q);
    const v = pot[j] * q + c * s;
    pot[j] = v;
    out[offset + j] = v;
  }
}

/** One year of the fused walk, contributions at the start of the year: pot ← (pot + C)·g·(1 − c). */
function yearStart(
  gross: Float64Array,
  r0: number,
  r1: number,
  r2: number,
  w0: number,
  w1: number,
  w2: number,
  charge: number,
  c: number,
  pot: Float64Array,
  out: Float32Array,
  offset: number,
  count: number,
): void {
  for (let j = 0; j < count; j++) {
    const v = (pot[j] + c) * (w0 * gross[r0 + j] + w1 * gross[r1 + j] + w2 * gross[r2 + j]) * charge;
    pot[j] = v;
    out[offset + j] = v;
  }
}
