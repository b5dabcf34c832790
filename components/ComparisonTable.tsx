import { ScrollView, Text, View } from 'react-native';
import { colors, space, type, type OptionStyle } from '@/constants/theme';
import { comparisonCells, comparisonColumns, LEAD_COLUMN_LABEL, leadCell, pinFirst, type ComparisonKey, type RankedOption } from '@/figures';
import { OptionMark } from './OptionMark';

// theme's `figure` is declared readonly; React Native's style type wants a mutable array.
const FIGURE = { ...type.figure, fontVariant: ['tabular-nums' as const] as 'tabular-nums'[] };

/** Column widths on screen; headings, order and every figure come from figures/. */
const WIDTH: Record<ComparisonKey, number> = {
  certaintyEquivalentPot: 150,
  certaintyEquivalentReturn: 120,
  medianReal: 120,
  p5Real: 120,
  probabilityReachingTarget: 130,
  expectedShortfallReal: 140,
  meanReal: 120,
  medianRealIncome: 110,
};

/**
 * Options ranked by certainty-equivalent pot at the chosen λ. Money is real (today's money)
 * and rounded for reading; "±" is one Monte Carlo standard error. The option column stays
 * put while the figures scroll sideways on a phone. The scheme's current default (the
 * baseline), when it is among the options, is pinned first and marked, with its rank. Beside
 * the certainty equivalent, each option's lead over the next-ranked one, marked when it is
 * within 2 standard errors (too close to call at this number of paths).
 */
export function ComparisonTable({
  rows: ranked,
  currency,
  lambda,
  styleOf,
  baselineId = null,
  testID = 'comparison-table',
}: {
  rows: RankedOption[];
  currency: string;
  lambda: number;
  styleOf: (optionId: string) => OptionStyle;
  baselineId?: string | null;
  testID?: string;
}) {
  const rows = pinFirst(ranked, baselineId);
  const tint = (optionId: string) => (optionId === baselineId ? colors.primaryTint : undefined);
  const cols = comparisonColumns(lambda);
  const cells = rows.map((r) => comparisonCells(r, currency));
  const leads = rows.map((r) => leadCell(r, currency));
  const rowH = leads.some((l) => l?.mark) ? 84 : 56;
  const LEAD_WIDTH = 170;
  return (
    <View style={{ flexDirection: 'row' }} testID={testID} accessibilityLabel="Options ranked by certainty-equivalent pot">
      <View style={{ width: 170, borderRightWidth: 1, borderColor: colors.rule }}>
        <Header label="Rank and option" width={170} />
        {rows.map((r) => (
          <View key={r.optionId} style={{ height: rowH, flexDirection: 'row', alignItems: 'center', gap: space.xs, borderTopWidth: 1, borderColor: colors.rule, paddingRight: space.xs, backgroundColor: tint(r.optionId) }} testID="ranked-option">
            <OptionMark style={styleOf(r.optionId)} size={12} />
            <View style={{ flex: 1 }}>
              <Text style={[type.label, { color: colors.ink }]} numberOfLines={2}>
                {r.rank}. {r.name}
              </Text>
              {r.optionId === baselineId ? (
                <Text style={[type.caption, { color: colors.primary }]} testID="baseline-mark">
                  Current default · baseline
                </Text>
              ) : null}
            </View>
          </View>
        ))}
      </View>
      <ScrollView horizontal>
        <View>
          <View style={{ flexDirection: 'row' }}>
            {cols.map((c) => [
              <Header key={c.key} label={c.label} width={WIDTH[c.key]} right />,
              c.key === 'certaintyEquivalentPot' ? <Header key="lead" label={LEAD_COLUMN_LABEL} width={LEAD_WIDTH} right /> : null,
            ])}
          </View>
          {rows.map((r, i) => (
            <View key={r.optionId} style={{ flexDirection: 'row', height: rowH, borderTopWidth: 1, borderColor: colors.rule, backgroundColor: tint(r.optionId) }}>
              {cols.map((c) => {
                const cell = cells[i][c.key];
                const lead = leads[i];
                return [
                  <View key={c.key} testID={`cell-${c.key}`} style={{ width: WIDTH[c.key], paddingHorizontal: space.sm, justifyContent: 'center', alignItems: 'flex-end' }}>
                    <Text style={[FIGURE, { color: colors.ink, textAlign: 'right' }]}>{cell.text}</Text>
                    {cell.standardError ? <Text style={[type.caption, { color: colors.mutedInk, fontVariant: ['tabular-nums' as const] }]}>{cell.standardError}</Text> : null}
                  </View>,
                  c.key === 'certaintyEquivalentPot' ? (
                    <View key="lead" testID="cell-lead" style={{ width: LEAD_WIDTH, paddingHorizontal: space.sm, justifyContent: 'center', alignItems: 'flex-end' }}>
                      <Text style={[FIGURE, { color: colors.ink, textAlign: 'right' }]}>{lead?.text ?? '—'}</Text>
                      {lead?.standardError ? <Text style={[type.caption, { color: colors.mutedInk, fontVariant: ['tabular-nums' as const] }]}>{lead.standardError}</Text> : null}
                      {lead?.mark ? (
                        <Text style={[type.caption, { color: colors.accentInk, textAlign: 'right', fontWeight: '600' }]} testID="too-close-mark">
                          {lead.mark}
                        </Text>
                      ) : null}
                    </View>
                  ) : null,
                ];
              })}
            </View>
          ))}
        </View>
      </ScrollView>
    </View>
  );
}

function Header({ label, width, right }: { label: string; width: number; right?: boolean }) {
  return (
    <View style={{ width, height: 56, justifyContent: 'flex-end', paddingHorizontal: right ? space.sm : 0, paddingBottom: space.xs }}>
      <Text style={[type.caption, { color: colors.mutedInk, textAlign: right ? 'right' : 'left', fontWeight: '600' }]}>{label}</Text>
    </View>
  );
}
