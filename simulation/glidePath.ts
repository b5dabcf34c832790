/**
 * Glide paths: fund weights as a function of years to retirement.
 *
 * Points are sorted by years to retirement. Between two points the weights are linearly
 * interpolated in years to retirement; beyond the first or last point the end point's
 * weights are held; a single point is a fixed mix. Since each point's weights sum to 1,
 * so does every interpolated mix.
 */
export interface GlidePoint {
  yearsToRetirement: number;
  weights: Record<string, number>;
}

/**
 * Weights (in the order of `fundIds`) at `yearsToRetirement`. Funds absent from a point
 * have weight 0 there. The result is written into `out` when given.
 */
export function weightsAt(
  glidePath: readonly GlidePoint[],
  fundIds: readonly string[],
  yearsToRetirement: number,
  out: Float64Array = new Float64Array(fundIds.length),
): Float64Array {
  if (glidePath.length === 0) throw new RangeError('a glide path needs at least one point');
  const points = [...glidePath].sort((a, b) => a.yearsToRetirement - b.yearsToRetirement);
  const first = points[0];
  const last = points[points.length - 1];
  let lo = first;
  let hi = first;
  let t = 0;
  if (yearsToRetirement <= first.yearsToRetirement) {
    lo = hi = first;
  } else if (yearsToRetirement >= last.yearsToRetirement) {
    lo = hi = last;
  } else {
    for (let k = 0; k + 1 < points.length; k++) {
      const a = points[k];
      const b = points[k + 1];
      if (yearsToRetirement >= a.yearsToRetirement && yearsToRetirement <= b.yearsToRetirement) {
        lo = a;
        hi = b;
        const span = b.yearsToRetirement - a.yearsToRetirement;
        t = span > 0 ? (yearsToRetirement - a.yearsToRetirement) / span : 0;
        break;
      }
    }
  }
  for (let i = 0; i < fundIds.length; i++) {
    const a = lo.weights[fundIds[i]] ?? 0;
    const b = hi.weights[fundIds[i]] ?? 0;
    out[i] = a + (b - a) * t;
  }
  return out;
}
