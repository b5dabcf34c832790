import { Text, View } from 'react-native';
import { colors, type } from '@/constants/theme';
import { differenceColumns, NOT_SEPARATED_TEXT, type DifferenceCell } from '@/figures';
import { DataTable, type Column } from './DataTable';

export type DifferenceRow = { optionId: string; option: string; ce: DifferenceCell; median: DifferenceCell; chance: DifferenceCell };

const FIGURE = { ...type.figure, fontVariant: ['tabular-nums' as const] as 'tabular-nums'[] };

function Cell({ c }: { c: DifferenceCell }) {
  return (
    <View style={{ alignItems: 'flex-end' }}>
      <Text style={[FIGURE, { color: colors.ink, textAlign: 'right' }]}>{c.text}</Text>
      {c.standardError ? <Text style={[type.caption, { color: colors.mutedInk, fontVariant: ['tabular-nums'] }]}>{c.standardError}</Text> : null}
      {c.tooCloseToCall ? (
        <Text style={[type.caption, { color: colors.accentInk, textAlign: 'right' }]} testID="not-separated-mark">
          {NOT_SEPARATED_TEXT}
        </Text>
      ) : null}
    </View>
  );
}

/** Each option against the baseline: certainty-equivalent pot, median pot and chance of target, each ± its standard error. Worded by figures/. */
export function DifferenceTable({ rows, baselineName, testID = 'differences' }: { rows: DifferenceRow[]; baselineName: string; testID?: string }) {
  const [option, ...figures] = differenceColumns(baselineName);
  const columns: Column<DifferenceRow>[] = [
    { key: option.key, title: option.label, width: 170, render: (r) => r.option },
    ...figures.map((c): Column<DifferenceRow> => ({ key: c.key, title: c.label, align: 'right', width: 190, render: (r) => <Cell c={r[c.key as 'ce' | 'median' | 'chance']} /> })),
  ];
  const marked = rows.some((r) => r.ce.tooCloseToCall || r.median.tooCloseToCall || r.chance.tooCloseToCall);
  return <DataTable label={`Differences to ${baselineName}`} columns={columns} rows={rows} rowKey={(r) => r.optionId} testID={testID} rowHeight={marked ? 84 : 56} />;
}
