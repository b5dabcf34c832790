import { Text, View } from 'react-native';
import { Rect } from 'react-native-svg';
import { BarChart } from 'react-native-chart-kit/v2';
import { colors, fonts, space, type, type OptionStyle } from '@/constants/theme';
import { NO_TARGET_TEXT, percent, type RankedOption } from '@/figures';
import { OptionMark } from './OptionMark';

type Row = { option: string; chance: number; [key: string]: unknown };

/**
 * The chance of reaching the income target, one bar per option in its own colour (a plain bar
 * chart, so react-native-chart-kit's bar chart serves). Percentages are worded by figures/; the
 * key figures follow as text.
 */
export function ChanceChart({ rows, width, styleOf }: { rows: RankedOption[]; width: number; styleOf: (optionId: string) => OptionStyle }) {
  // A run without an income target has no chance to chart (null): those options are left out.
  const data: Row[] = rows.flatMap((r) => {
    const chance = r.pair.atRetirement.probabilityReachingTarget;
    return chance === null ? [] : [{ option: `${r.rank}. ${r.name}`, chance }];
  });
  const summary = data.length ? rows.map((r) => `${r.name} ${percent(r.pair.atRetirement.probabilityReachingTarget, 'chance')}`).join('; ') : NO_TARGET_TEXT;
  const height = Math.max(140, 46 * rows.length + 50);
  return (
    <View style={{ gap: space.xs }} testID="chance-chart">
      <Text style={[type.label, { color: colors.ink }]} accessibilityRole="header">
        Chance of reaching the income target
      </Text>
      {width > 0 ? (
        <BarChart<Row>
          data={data}
          xKey="option"
          yKey="chance"
          width={width}
          height={height}
          orientation="horizontal"
          yDomain={[0, 1]}
          yTickCount={5}
          formatYLabel={(v) => percent(v, 'chance')}
          showValuesOnTopOfBars
          interaction="none"
          tooltip={false}
          legend={false}
          accessibilityLabel={`Chance of reaching the income target: ${summary}.`}
          theme={{
            background: colors.surface,
            plotBackground: colors.surface,
            grid: colors.rule,
            axis: colors.mutedInk,
            text: colors.ink,
            mutedText: colors.mutedInk,
            series: rows.map((r) => styleOf(r.optionId).colour),
            typography: { fontFamily: fonts.regular },
          }}
          renderBar={({ bar }) => <Rect key={bar.key} x={bar.x} y={bar.y} width={bar.width} height={bar.height} fill={styleOf(rows[bar.dataIndex].optionId).colour} rx={2} />}
        />
      ) : null}
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
        {rows.map((r) => (
          <View key={r.optionId} style={{ flexDirection: 'row', alignItems: 'center', gap: 4 }}>
            <OptionMark style={styleOf(r.optionId)} size={10} />
            <Text style={[type.caption, { color: colors.ink }]}>{r.name}</Text>
          </View>
        ))}
      </View>
      <Text style={[type.caption, { color: colors.mutedInk }]} testID="chance-chart-text">
        {summary}.
      </Text>
    </View>
  );
}
