import { fastExp } from './fastMath';
import { standardNormalQuantile } from './normal';
import type { PreparedScenario } from './prepare';
import { createStream, PATHS_PER_STREAM, toOpenUnit, type RandomStream } from './random';
import { Xoshiro128 } from './xoshiro';
import { zigguratNormals } from './ziggurat';

/**
 * The market step: every fund's gross return 1 + Rᵢ = exp(Xᵢ) for each year of a block of
 * paths, generated once and shared by every option and member (common random numbers; year y
 * is the y-th year from now for every member).
 *
 * Layout (paths innermost, so the member walk reads and writes consecutive memory):
 *   gross[(y × funds + i) × blockSize + j] for path first + j, year y, fund i.
 *
 * A market generator is built per range of paths and keeps whatever state lets it continue
 * cheaply from one block to the next; every path's numbers depend only on (seed, path).
 */
export interface MarketGenerator {
  /** Fill `gross` for paths [first, first + count), count ≤ blockSize. */
  fill(first: number, count: number, gross: Float64Array, blockSize: number): void;
}

/** The generator of the scenario's format. */
export function marketFor(prepared: PreparedScenario): MarketGenerator {
  return prepared.scenario.version === 1 ? new FormatOneMarket(prepared) : new FormatTwoMarket(prepared);
}

/**
 * Format 1 (engine 1's numbers, kept for reproducibility): paths are grouped 256 to a stream
 * of seedrandom's Alea seeded with `keelson/<seed>/<block>`; every draw set consumes exactly
 * years × funds uniforms, turned into normals by the inverse normal cdf (AS 241); fund i's log
 * return is μᵢ + σᵢ·(L z)ᵢ with L the Cholesky factor; antithetic paths 2k and 2k+1 share draw
 * set k, the second negated.
 */
class FormatOneMarket implements MarketGenerator {
  private readonly prepared: PreparedScenario;
  private readonly normals: Float64Array;
  private readonly correlated: Float64Array;
  private stream: RandomStream | null = null;
  private streamIndex = -1;
  private position = 0; // draw sets consumed from the current stream
  private heldSet = -1; // draw set currently in `normals`

  constructor(prepared: PreparedScenario) {
    this.prepared = prepared;
    this.normals = new Float64Array(prepared.maxYears * prepared.fundCount);
    this.correlated = new Float64Array(prepared.fundCount);
  }

  fill(first: number, count: number, gross: Float64Array, blockSize: number): void {
    const { scenario, fundCount: F, maxYears: Y, mu, sigma, chol } = this.prepared;
    const D = Y * F;
    const antithetic = scenario.antithetic;
    const normals = this.normals;
    const correlated = this.correlated;
    // Imported bindings are read once: compiled CommonJS turns each use into a property read.
    const quantile = standardNormalQuantile;
    const openUnit = toOpenUnit;
    const perStream = PATHS_PER_STREAM;
    const exp = Math.exp;
    for (let j = 0; j < count; j++) {
      const p = first + j;
      const drawSet = antithetic ? Math.floor(p / 2) : p;
      const sign = antithetic && p % 2 === 1 ? -1 : 1;
      if (drawSet !== this.heldSet) {
        const block = Math.floor(drawSet / perStream);
        const offset = drawSet - block * perStream;
        if (this.stream === null || block !== this.streamIndex || offset < this.position) {
          this.stream = createStream(scenario.seed, block);
          this.streamIndex = block;
          this.position = 0;
        }
        const next = this.stream.next;
        for (let skip = (offset - this.position) * D; skip > 0; skip--) next();
        for (let k = 0; k < D; k++) normals[k] = quantile(openUnit(next()));
        this.position = offset + 1;
        this.heldSet = drawSet;
      }
      for (let y = 0; y < Y; y++) {
        const base = y * F;
        for (let i = 0; i < F; i++) {
          let s = 0;
          const row = i * F;
          for (let k = 0; k <= i; k++) s += chol[row + k] * normals[base + k];
          correlated[i] = s;
        }
        for (let i = 0; i < F; i++) gross[(base + i) * blockSize + j] = exp(mu[i] + sigma[i] * sign * correlated[i]);
      }
    }
  }
}

/**
 * Format 2: draw set k (path k, or paths 2k and 2k+1 with antithetic variates) draws from its
 * own xoshiro128** stream seeded from (seed, k) (xoshiro.ts): years × funds normals by the
 * ziggurat (ziggurat.ts), year by year, fund by fund; the second path of an antithetic pair
 * takes them negated. The block is then transformed in place, row by row over all its paths
 * (long loops, the same for any number of funds): for each year, funds in descending order,
 *   Xᵢ = μᵢ + Σ_{k≤i} (diag(σ) L)ᵢₖ zₖ,   1 + Rᵢ = fastExp(Xᵢ)
 * (descending, so the normals a row still needs are not yet overwritten).
 */
class FormatTwoMarket implements MarketGenerator {
  private readonly prepared: PreparedScenario;
  private readonly generator = new Xoshiro128();
  private readonly z: Float64Array;

  constructor(prepared: PreparedScenario) {
    this.prepared = prepared;
    this.z = new Float64Array(prepared.maxYears * prepared.fundCount);
  }

  fill(first: number, count: number, gross: Float64Array, blockSize: number): void {
    const { scenario, fundCount: F, maxYears: Y, mu, scaledChol: A } = this.prepared;
    const antithetic = scenario.antithetic;
    const g = this.generator;
    const z = this.z;
    const D = Y * F;
    const normals = zigguratNormals;
    const seed = scenario.seed;
    // 1. Normals, path by path, into the block's layout.
    let j = 0;
    while (j < count) {
      const p = first + j;
      if (!antithetic) {
        normals(g.seed(seed, p), gross, D, j, blockSize);
        j++;
        continue;
      }
      normals(g.seed(seed, Math.floor(p / 2)), z, D);
      const odd = p % 2 === 1;
      for (let k = 0; k < D; k++) gross[k * blockSize + j] = odd ? -z[k] : z[k];
      j++;
      if (!odd && j < count) {
        for (let k = 0; k < D; k++) gross[k * blockSize + j] = -z[k];
        j++;
      }
    }
    // 2. Correlate, add the mean and exponentiate, row by row.
    const exp = fastExp;
    for (let y = 0; y < Y; y++) {
      const base = y * F;
      for (let i = F - 1; i >= 0; i--) {
        const row = (base + i) * blockSize;
        const m = mu[i];
        const diagonal = A[i * F + i];
        let last = -1; // the last fund whose normal enters this row
        for (let k = 0; k < i; k++) if (A[i * F + k] !== 0) last = k;
        if (last < 0) {
          for (let t = 0; t < count; t++) gross[row + t] = exp(m + diagonal * gross[row + t]);
          continue;
        }
        for (let t = 0; t < count; t++) gross[row + t] = m + diagonal * gross[row + t];
        for (let k = 0; k < last; k++) {
          const a = A[i * F + k];
          if (a === 0) continue;
          const from = (base + k) * blockSize;
          for (let t = 0; t < count; t++) gross[row + t] += a * gross[from + t];
        }
        const a = A[i * F + last];
        const from = (base + last) * blockSize;
        for (let t = 0; t < count; t++) gross[row + t] = exp(gross[row + t] + a * gross[from + t]);
      }
    }
  }
}

/**
 * The fund log returns X (before exponentiation) that path `path` sees, as [year × funds + i].
 * For checks of the draws (moments and correlations); the market step computes the same values.
 */
export function pathLogReturns(prepared: PreparedScenario, path: number): Float64Array {
  const { fundCount: F, maxYears: Y } = prepared;
  const gross = new Float64Array(Y * F);
  marketFor(prepared).fill(path, 1, gross, 1);
  const out = new Float64Array(Y * F);
  for (let k = 0; k < Y * F; k++) out[k] = Math.log(gross[k]);
  return out;
}
