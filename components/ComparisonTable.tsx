import { ScrollView, Text, View } from 'react-native';
import { colors, space, type } from '@/constants/theme';
import { money, pct, type OptionFigures } from './projectionFigures';

// theme's `figure` is declared readonly; React Native's style type wants a mutable array.
const FIGURE = { ...type.figure, fontVariant: ['tabular-nums' as const] as 'tabular-nums'[] };

type Col = { label: string; width: number; value: (r: OptionFigures) => string; se?: (r: OptionFigures) => string | null };

/**
 * Options ranked by certainty-equivalent pot at the chosen λ. Money is real (today's money)
 * and rounded for reading; "±" is one Monte Carlo standard error. The option column stays
 * put while the figures scroll sideways on a phone. The scheme's current default (the
 * baseline), when it is among the options, is pinned first and marked, with its rank.
 */
export function ComparisonTable({ rows: ranked, currency, lambda, colorOf, baselineId = null }: { rows: OptionFigures[]; currency: string; lambda: number; colorOf: (optionId: string) => string; baselineId?: string | null }) {
  const rankOf = new Map(ranked.map((r, i) => [r.optionId, i + 1]));
  const rows = pinFirst(ranked, baselineId);
  const m = (v: number) => money(v, currency);
  const se = (v: number) => (Number.isFinite(v) ? `± ${m(v)}` : null);
  const cols: Col[] = [
    { label: `Certainty-equivalent pot (λ = ${lambda})`, width: 150, value: (r) => m(r.cePot), se: (r) => se(r.ceStandardError) },
    { label: 'CE annual real return', width: 110, value: (r) => pct(r.ceAnnualReturn, 2) },
    { label: 'Median pot', width: 120, value: (r) => m(r.pair.atRetirement.percentiles.real.p50), se: (r) => se(r.pair.extraStandardErrors.p50Real) },
    { label: '5th percentile pot', width: 120, value: (r) => m(r.pair.atRetirement.percentiles.real.p5), se: (r) => se(r.pair.extraStandardErrors.p5Real) },
    {
      label: 'Chance of reaching the income target',
      width: 130,
      value: (r) => pct(r.pair.atRetirement.probabilityReachingTarget, 0),
      se: (r) => `± ${pct(r.pair.extraStandardErrors.probabilityReachingTarget, 1)}`,
    },
    { label: 'Expected shortfall (mean of worst 5%)', width: 140, value: (r) => m(r.pair.atRetirement.expectedShortfall.real) },
    { label: 'Mean pot', width: 120, value: (r) => m(r.pair.atRetirement.mean.real), se: (r) => se(r.pair.atRetirement.standardError.real) },
  ];
  const rowH = 56;
  return (
    <View style={{ flexDirection: 'row' }} testID="comparison-table" accessibilityLabel="Options ranked by certainty-equivalent pot">
      <View style={{ width: 150, borderRightWidth: 1, borderColor: colors.rule }}>
        <Header label="Rank and option" width={150} />
        {rows.map((r) => {
          const baseline = r.optionId === baselineId;
          return (
            <View
              key={r.optionId}
              style={{ height: rowH, flexDirection: 'row', alignItems: 'center', gap: space.xs, borderTopWidth: 1, borderColor: colors.rule, paddingRight: space.xs, backgroundColor: baseline ? colors.primaryTint : undefined }}
              testID="ranked-option"
            >
              <View style={{ width: 10, height: 10, borderRadius: 5, backgroundColor: colorOf(r.optionId) }} />
              <View style={{ flex: 1 }}>
                <Text style={[type.label, { color: colors.ink }]} numberOfLines={2}>
                  {rankOf.get(r.optionId)}. {r.name}
                </Text>
                {baseline ? (
                  <Text style={[type.caption, { color: colors.primary }]} testID="baseline-mark">
                    Current default · baseline
                  </Text>
                ) : null}
              </View>
            </View>
          );
        })}
      </View>
      <ScrollView horizontal>
        <View>
          <View style={{ flexDirection: 'row' }}>
            {cols.map((c) => (
              <Header key={c.label} label={c.label} width={c.width} right />
            ))}
          </View>
          {rows.map((r) => (
            <View key={r.optionId} style={{ flexDirection: 'row', height: rowH, borderTopWidth: 1, borderColor: colors.rule, backgroundColor: r.optionId === baselineId ? colors.primaryTint : undefined }}>
              {cols.map((c) => {
                const s = c.se?.(r);
                return (
                  <View key={c.label} style={{ width: c.width, paddingHorizontal: space.sm, justifyContent: 'center', alignItems: 'flex-end' }}>
                    <Text style={[FIGURE, { color: colors.ink, textAlign: 'right' }]}>{c.value(r)}</Text>
                    {s ? <Text style={[type.caption, { color: colors.mutedInk, fontVariant: ['tabular-nums' as const] }]}>{s}</Text> : null}
                  </View>
                );
              })}
            </View>
          ))}
        </View>
      </ScrollView>
    </View>
  );
}

/** The rows with the baseline's moved to the top (others keep their order). */
export function pinFirst<T extends { optionId: string }>(rows: T[], baselineId: string | null): T[] {
  const at = rows.findIndex((r) => r.optionId === baselineId);
  return at < 0 ? rows : [rows[at], ...rows.slice(0, at), ...rows.slice(at + 1)];
}

function Header({ label, width, right }: { label: string; width: number; right?: boolean }) {
  return (
    <View style={{ width, height: 56, justifyContent: 'flex-end', paddingHorizontal: right ? space.sm : 0, paddingBottom: space.xs }}>
      <Text style={[type.caption, { color: colors.mutedInk, textAlign: right ? 'right' : 'left', fontWeight: '600' }]}>{label}</Text>
    </View>
  );
}
