/**
 * Sets fund `id` to `value` (a fraction, clamped to [0, 1]) and spreads the difference over
 * the other funds in proportion to their weights — or onto the next fund in `fundIds` when the
 * others hold nothing — so the point still sums to 1. Zero weights are dropped.
 */
export function rebalance(weights: Record<string, number>, fundIds: string[], id: string, value: number): Record<string, number> {
  const v = Math.min(1, Math.max(0, value));
  const others = fundIds.filter((f) => f !== id);
  if (others.length === 0) return { [id]: 1 };
  const rest = others.reduce((s, f) => s + (weights[f] ?? 0), 0);
  const target = 1 - v;
  const out: Record<string, number> = { [id]: v };
  if (rest > 1e-12) for (const f of others) out[f] = ((weights[f] ?? 0) / rest) * target;
  else {
    const idx = fundIds.indexOf(id);
    out[others.find((f) => fundIds.indexOf(f) > idx) ?? others[0]] = target;
  }
  // Any rounding residue goes to the largest other weight, so the sum is 1 to the last bit that matters.
  const sum = Object.values(out).reduce((s, w) => s + w, 0);
  const largest = others.reduce((a, b) => ((out[b] ?? 0) > (out[a] ?? 0) ? b : a), others[0]);
  out[largest] = Math.max(0, (out[largest] ?? 0) + (1 - sum));
  return Object.fromEntries(Object.entries(out).filter(([, w]) => w > 1e-12));
}
