/**
 * Bracketing root search: the Illinois variant of regula falsi, with a bisection step every
 * fourth iteration so the bracket always shrinks. `f(lo)` and `f(hi)` must have opposite
 * signs (or one be zero). Stops when the bracket is narrower than `tolerance` or f is
 * exactly zero; at most 300 iterations.
 */
export function findRoot(f: (x: number) => number, lo: number, hi: number, tolerance = 1e-10): number {
  let a = lo;
  let b = hi;
  let fa = f(a);
  let fb = f(b);
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (!(Math.sign(fa) !== Math.sign(fb)) || Number.isNaN(fa) || Number.isNaN(fb)) {
    throw new RangeError(`root is not bracketed in [${lo}, ${hi}] (f = ${fa}, ${fb})`);
  }
  for (let k = 0; k < 300 && Math.abs(b - a) > tolerance; k++) {
    if (k % 4 === 3) {
      const m = (a + b) / 2;
      const fm = f(m);
      if (fm === 0) return m;
      if (Math.sign(fm) !== Math.sign(fb)) {
        a = m;
        fa = fm;
      } else {
        b = m;
        fb = fm;
      }
      continue;
    }
    let c = b - (fb * (b - a)) / (fb - fa);
    if (!(c > Math.min(a, b) && c < Math.max(a, b))) c = (a + b) / 2;
    const fc = f(c);
    if (fc === 0) return c;
    if (Math.sign(fc) !== Math.sign(fb)) {
      a = b;
      fa = fb;
    } else {
      fa /= 2;
    }
    b = c;
    fb = fc;
  }
  return (a + b) / 2;
}
