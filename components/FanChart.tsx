import { Text, View } from 'react-native';
import Svg, { G, Line, Path, Text as SvgText } from 'react-native-svg';
import { colors, space, type, type OptionStyle } from '@/constants/theme';
import { FAN_LEGEND, fanChartSummary, moneyAxis, potAxisLabel, wholeTicks } from '@/figures';
import { OptionMark } from './OptionMark';

export type FanChartProps = {
  title: string;
  ages: number[];
  /** Pot by age for percentiles p5, p25, p50, p75, p95. */
  bands: Record<string, number[]>;
  /** Pot needed for the income target at retirement, when there is one. */
  target?: number | null;
  currency: string;
  realTerms: boolean;
  width: number;
  /** Shared upper limit of the money axis, so charts side by side compare at a glance. */
  yMax?: number;
  /** The option's own mark (colour, dash, marker), shown beside the title. */
  option?: OptionStyle;
};

const HEIGHT = 220;
const PAD = { left: 58, right: 12, top: 12, bottom: 40 };

/**
 * Percentile fan: the 5–95 band (lightest spruce), the 25–75 band (stronger), the median in
 * ochre, and the pot needed for the income target as a dashed ink line at retirement.
 */
export function FanChart({ title, ages, bands, target, currency, realTerms, width, yMax, option }: FanChartProps) {
  const w = Math.max(240, width);
  const plotW = w - PAD.left - PAD.right;
  const plotH = HEIGHT - PAD.top - PAD.bottom;
  const axis = moneyAxis(yMax ?? Math.max(...bands.p95, target ?? 0) * 1.05, currency);
  const yTop = axis.max;
  const x = (i: number) => PAD.left + (ages.length === 1 ? 0 : (i / (ages.length - 1)) * plotW);
  const y = (v: number) => PAD.top + plotH - (Math.min(v, yTop) / yTop) * plotH;
  const area = (lo: number[], hi: number[]) =>
    `M${hi.map((v, i) => `${x(i)},${y(v)}`).join('L')}L${lo
      .map((v, i) => [x(i), y(v)] as const)
      .reverse()
      .map(([a, b]) => `${a},${b}`)
      .join('L')}Z`;
  const line = (vals: number[]) => `M${vals.map((v, i) => `${x(i)},${y(v)}`).join('L')}`;
  const ticks = axis.ticks;
  const ageTicks = wholeTicks(ages[0], ages[ages.length - 1])
    .map((a) => [a, ages.indexOf(a)] as const)
    .filter(([, i]) => i >= 0);
  const summary = fanChartSummary({ title, ages, bands, target, currency, realTerms });

  return (
    <View style={{ gap: space.xs }} testID="fan-chart">
      <View style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm }}>
        {option ? <OptionMark style={option} /> : null}
        <Text style={[type.label, { color: colors.ink, flex: 1 }]} accessibilityRole="header">
          {title}
        </Text>
      </View>
      <Svg width={w} height={HEIGHT} accessibilityLabel={summary} role="img">
        <G>
          {ticks.map((t) => (
            <G key={t}>
              <Line x1={PAD.left} x2={w - PAD.right} y1={y(t)} y2={y(t)} stroke={colors.rule} strokeWidth={1} />
              <SvgText x={PAD.left - 6} y={y(t) + 4} fontSize={11} fill={colors.mutedInk} textAnchor="end">
                {axis.label(t)}
              </SvgText>
            </G>
          ))}
          <Path d={area(bands.p5, bands.p95)} fill={colors.band90} />
          <Path d={area(bands.p25, bands.p75)} fill={colors.band50} />
          <Path d={line(bands.p50)} stroke={colors.median} strokeWidth={2.5} fill="none" />
          {target ? <Line x1={PAD.left} x2={w - PAD.right} y1={y(target)} y2={y(target)} stroke={colors.target} strokeWidth={1.5} strokeDasharray="6 4" /> : null}
          <Line x1={PAD.left} x2={w - PAD.right} y1={PAD.top + plotH} y2={PAD.top + plotH} stroke={colors.mutedInk} strokeWidth={1} />
          {ageTicks.map(([a, i]) => (
            <SvgText key={a} x={x(i)} y={PAD.top + plotH + 14} fontSize={11} fill={colors.mutedInk} textAnchor="middle">
              {a}
            </SvgText>
          ))}
          <SvgText x={PAD.left + plotW / 2} y={HEIGHT - 6} fontSize={11} fill={colors.ink} textAnchor="middle">
            Age (years)
          </SvgText>
          <SvgText x={12} y={PAD.top + plotH / 2} fontSize={11} fill={colors.ink} textAnchor="middle" transform={`rotate(-90 12 ${PAD.top + plotH / 2})`}>
            {potAxisLabel(currency, realTerms)}
          </SvgText>
        </G>
      </Svg>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
        <Key swatch={colors.band90} label={FAN_LEGEND.outer} />
        <Key swatch={colors.band50} label={FAN_LEGEND.inner} />
        <Key swatch={colors.median} label={FAN_LEGEND.median} line />
        {target ? <Key swatch={colors.target} label={FAN_LEGEND.target} dashed /> : null}
      </View>
      <Text style={[type.caption, { color: colors.mutedInk }]} testID="fan-chart-text">
        {summary}
      </Text>
    </View>
  );
}

function Key({ swatch, label, line, dashed }: { swatch: string; label: string; line?: boolean; dashed?: boolean }) {
  return (
    <View style={{ flexDirection: 'row', alignItems: 'center', gap: 4 }}>
      <View
        style={
          line || dashed
            ? { width: 16, height: 0, borderTopWidth: 2, borderColor: swatch, borderStyle: dashed ? 'dashed' : 'solid' }
            : { width: 14, height: 10, backgroundColor: swatch, borderRadius: 2 }
        }
      />
      <Text style={[type.caption, { color: colors.ink }]}>{label}</Text>
    </View>
  );
}
