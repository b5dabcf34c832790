import type { Xoshiro128 } from './xoshiro';

/**
 * Standard normal draws for scenario format 2: the ziggurat method (Marsaglia & Tsang, "The
 * ziggurat method for generating random variables", J. Statistical Software 5(8), 2000) with
 * 256 layers, taking the layer index from bits that are not used for the value (Doornik, "An
 * improved ziggurat method to generate normal random samples", 2005), and a signed 45-bit
 * value. About 99 % of draws need two 32-bit words, a table look-up, two compares and a few
 * multiplications; the rest take the wedge or tail branch.
 *
 * Layers: with f(x) = exp(−x²/2), x₁ = r, x_{i+1} = f⁻¹(f(xᵢ) + v/xᵢ) and x₂₅₆ = 0, every layer
 * has area v = r·f(r) + ∫_r^∞ f. Layer 0 is the base strip plus the tail, of width x₀ = v/f(r).
 * r is the root of "the top layer closes at x = 0", solved once (bisection on the recursion,
 * tail area from erfc): r = 3.654152885361009, matching the published 256-layer constant.
 */
export const ZIGGURAT_LAYERS = 256;
export const ZIGGURAT_R = 3.654152885361009;

const f = (x: number) => Math.exp(-0.5 * x * x);

/** ∫_r^∞ exp(−x²/2) dx by the continued fraction for Mills' ratio (r > 3: 60 terms are ample). */
function tailArea(r: number): number {
  let cf = r;
  for (let k = 60; k >= 1; k--) cf = r + k / cf;
  return f(r) / cf;
}

/** Layer edges x₀ … x₂₅₆ and f at each edge. */
export const ZIGGURAT_X = new Float64Array(ZIGGURAT_LAYERS + 1);
export const ZIGGURAT_F = new Float64Array(ZIGGURAT_LAYERS + 1);
/** Common area v of every layer. */
export const ZIGGURAT_V = ZIGGURAT_R * f(ZIGGURAT_R) + tailArea(ZIGGURAT_R);
{
  const X = ZIGGURAT_X;
  X[0] = ZIGGURAT_V / f(ZIGGURAT_R);
  X[1] = ZIGGURAT_R;
  for (let i = 1; i < ZIGGURAT_LAYERS - 1; i++) X[i + 1] = Math.sqrt(-2 * Math.log(f(X[i]) + ZIGGURAT_V / X[i]));
  X[ZIGGURAT_LAYERS] = 0;
  for (let i = 0; i <= ZIGGURAT_LAYERS; i++) ZIGGURAT_F[i] = f(X[i]);
}

/** 2^-44: the signed 45-bit value (k + ½)·2^-44 lies in (−1, 1). */
const TWO_M44 = 5.684341886080802e-14;

/**
 * One standard normal from `g`. Two 32-bit words a, b: the layer is a's low 8 bits; the value
 * u = ((a >> 8)·2^21 + (b >>> 11) + ½)·2^-44, a signed 45-bit number in (−1, 1) from a's high
 * 24 bits and b's high 21 bits (sign included, so no branch on it); x = u·x_layer.
 */
export function zigguratNormal(g: Xoshiro128): number {
  const X = ZIGGURAT_X;
  for (;;) {
    const a = g.nextInt();
    const b = g.nextInt();
    const layer = a & 255;
    const v = ((a >> 8) * 2097152 + (b >>> 11) + 0.5) * TWO_M44 * X[layer];
    const edge = X[layer + 1];
    if (v < edge && v > -edge) return v;
    const z = slowPath(g, layer, v);
    if (z === z) return z; // NaN: rejected, draw again
  }
}

/**
 * `count` standard normals from `g` into out[offset + k·stride], k = 0 … count − 1: the same
 * numbers as `count` calls of zigguratNormal, with the generator's state in local variables on
 * the fast path.
 */
export function zigguratNormals(g: Xoshiro128, out: Float64Array, count: number, offset = 0, stride = 1): void {
  const X = ZIGGURAT_X;
  let s0 = g.s0;
  let s1 = g.s1;
  let s2 = g.s2;
  let s3 = g.s3;
  for (let k = 0; k < count; k++) {
    // Two xoshiro128** steps (as Xoshiro128.nextInt).
    let x = Math.imul(s1, 5);
    const a = Math.imul((x << 7) | (x >>> 25), 9);
    let t = s1 << 9;
    s2 ^= s0;
    s3 ^= s1;
    s1 ^= s2;
    s0 ^= s3;
    s2 ^= t;
    s3 = (s3 << 11) | (s3 >>> 21);
    x = Math.imul(s1, 5);
    const b = Math.imul((x << 7) | (x >>> 25), 9);
    t = s1 << 9;
    s2 ^= s0;
    s3 ^= s1;
    s1 ^= s2;
    s0 ^= s3;
    s2 ^= t;
    s3 = (s3 << 11) | (s3 >>> 21);
    const layer = a & 255;
    const v = ((a >> 8) * 2097152 + (b >>> 11) + 0.5) * TWO_M44 * X[layer];
    const edge = X[layer + 1];
    if (v < edge && v > -edge) {
      out[offset + k * stride] = v;
      continue;
    }
    // Slow path (about 1 % of draws): finish this normal through the generator object.
    g.s0 = s0;
    g.s1 = s1;
    g.s2 = s2;
    g.s3 = s3;
    const z = slowPath(g, layer, v);
    out[offset + k * stride] = z === z ? z : zigguratNormal(g);
    s0 = g.s0;
    s1 = g.s1;
    s2 = g.s2;
    s3 = g.s3;
  }
  g.s0 = s0;
  g.s1 = s1;
  g.s2 = s2;
  g.s3 = s3;
}

/** Layer 0 beyond r: the tail; other layers: the wedge. NaN when the point is rejected. */
function slowPath(g: Xoshiro128, layer: number, v: number): number {
  const z = layer === 0 ? tail(g) : wedge(g, layer, Math.abs(v));
  return v < 0 ? -z : z;
}

/** Tail beyond r (Marsaglia, 1964): x = −ln(U₁)/r, y = −ln(U₂), accept when 2y > x². */
function tail(g: Xoshiro128): number {
  for (;;) {
    const x = -Math.log(1 - g.next()) / ZIGGURAT_R;
    const y = -Math.log(1 - g.next());
    if (y + y > x * x) return ZIGGURAT_R + x;
  }
}

/** A point in the wedge of `layer` at abscissa x ≥ 0: x when under the curve, else NaN. */
function wedge(g: Xoshiro128, layer: number, x: number): number {
  const F = ZIGGURAT_F;
  const y = F[layer] + g.next() * (F[layer + 1] - F[layer]);
  return y < f(x) ? x : Number.NaN;
}
