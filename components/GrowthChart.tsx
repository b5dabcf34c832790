import { useMemo, useState } from 'react';
import { Text, View } from 'react-native';
import Svg, { G, Line, Path, Text as SvgText } from 'react-native-svg';
import { colors, fundColour, space, type } from '@/constants/theme';
import { decimal, valueAxis } from '@/figures';

type Props = {
  dates: string[];
  series: { id: string; name: string; colourIndex: number; values: number[] }[];
  height?: number;
  title?: string;
};

/** Growth of one unit invested at the first month-end, one line per fund. */
export function GrowthChart({ dates, series, height = 240, title = 'Growth of 1 unit' }: Props) {
  const [width, setWidth] = useState(0);
  const all = series.flatMap((s) => s.values);
  const lo = Math.min(1, ...all);
  const hi = Math.max(1, ...all);
  const axis = useMemo(() => valueAxis(lo, hi), [lo, hi]);
  const ticks = axis.ticks;
  const yLo = axis.min;
  const yHi = axis.max;
  const pad = { left: 44, right: 10, top: 8, bottom: 36 };
  const w = Math.max(0, width - pad.left - pad.right);
  const h = height - pad.top - pad.bottom;
  const n = dates.length;
  const x = (k: number) => pad.left + (n > 1 ? (k / (n - 1)) * w : 0);
  const y = (v: number) => pad.top + (1 - (v - yLo) / (yHi - yLo || 1)) * h;
  const years = dates.map((d, k) => [d.slice(0, 4), k] as const).filter(([yy, k]) => k === 0 || dates[k - 1].slice(0, 4) !== yy);
  const every = Math.max(1, Math.ceil(years.length / 6));
  const summary = series.map((s) => `${s.name}: 1 became ${decimal(s.values[s.values.length - 1], 2)}`).join('; ');

  return (
    <View style={{ gap: space.sm }}>
      <Text style={[type.label, { color: colors.ink }]}>{title}</Text>
      <View onLayout={(e) => setWidth(e.nativeEvent.layout.width)} role="img" accessibilityLabel={`${title}, ${dates[0]} to ${dates[n - 1]}. ${summary}.`}>
        {width > 0 ? (
          <Svg width={width} height={height}>
            {ticks.map((t) => (
              <G key={t}>
                <Line x1={pad.left} x2={pad.left + w} y1={y(t)} y2={y(t)} stroke={t === 1 ? colors.referenceLine : colors.rule} strokeWidth={1} />
                <SvgText x={pad.left - 6} y={y(t) + 4} fontSize={11} fill={colors.mutedInk} textAnchor="end">
                  {axis.label(t)}
                </SvgText>
              </G>
            ))}
            {series.map((s) => (
              <Path key={s.id} d={s.values.map((v, k) => `${k === 0 ? 'M' : 'L'}${x(k).toFixed(1)},${y(v).toFixed(1)}`).join('')} stroke={fundColour(s.colourIndex)} strokeWidth={2} fill="none" />
            ))}
            {years
              .filter((_, k) => k % every === 0)
              .map(([yy, k]) => (
                <SvgText key={yy} x={x(k)} y={pad.top + h + 14} fontSize={11} fill={colors.mutedInk} textAnchor="middle">
                  {yy}
                </SvgText>
              ))}
            <SvgText x={pad.left + w / 2} y={height - 4} fontSize={11} fill={colors.mutedInk} textAnchor="middle">
              Month-end (value of 1 unit, total return)
            </SvgText>
          </Svg>
        ) : (
          <View style={{ height }} />
        )}
      </View>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
        {series.map((s) => (
          <View key={s.id} style={{ flexDirection: 'row', alignItems: 'center', gap: 6 }}>
            <View style={{ width: 14, height: 3, backgroundColor: fundColour(s.colourIndex) }} />
            <Text style={[type.caption, { color: colors.ink }]}>{s.name}</Text>
          </View>
        ))}
      </View>
      <Text style={[type.caption, { color: colors.mutedInk }]}>{summary}.</Text>
    </View>
  );
}
