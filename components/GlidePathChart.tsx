import { useMemo, useState } from 'react';
import { Text, View } from 'react-native';
import Svg, { G, Line, Path, Text as SvgText } from 'react-native-svg';
import { weightsAt, type GlidePoint } from '@/simulation';
import { colors, fundColour, space, type } from '@/constants/theme';
import { glideMixText, shareAxis, wholeTicks } from '@/figures';

type Props = {
  funds: { id: string; name: string }[];
  glidePath: GlidePoint[];
  /** Leftmost point of the x axis, in years to retirement. */
  fromYears?: number;
  height?: number;
  title?: string;
  /** Hide the legend and text summary (for small previews in lists). */
  compact?: boolean;
};

/**
 * Fund weights from `fromYears` to retirement as stacked areas. Interpolation is the
 * engine's own (weightsAt), so the picture matches what a projection will use.
 */
export function GlidePathChart({ funds, glidePath, fromYears = 40, height = 220, title = 'Glide path', compact }: Props) {
  const [width, setWidth] = useState(0);
  const ids = useMemo(() => funds.map((f) => f.id), [funds]);
  const years = useMemo(() => Array.from({ length: fromYears + 1 }, (_, k) => fromYears - k), [fromYears]);
  const weights = useMemo(() => (glidePath.length ? years.map((y) => Array.from(weightsAt(glidePath, ids, y))) : []), [glidePath, ids, years]);
  const used = funds.map((f, i) => ({ ...f, i })).filter((f) => weights.some((w) => w[f.i] > 1e-9));

  const share = shareAxis();
  const pad = { left: compact ? 4 : 40, right: 8, top: 8, bottom: compact ? 4 : 34 };
  const w = Math.max(0, width - pad.left - pad.right);
  const h = height - pad.top - pad.bottom;
  const x = (k: number) => pad.left + (k / fromYears) * w;
  const y = (v: number) => pad.top + (1 - v) * h;

  const areas = useMemo(() => {
    if (!weights.length || w <= 0) return [];
    const lower = new Array<number>(weights.length).fill(0);
    return used.map((f) => {
      const upper = weights.map((wt, k) => lower[k] + wt[f.i]);
      const top = upper.map((v, k) => `${k === 0 ? 'M' : 'L'}${x(k).toFixed(1)},${y(v).toFixed(1)}`).join('');
      const bottom = lower
        .map((v, k) => [k, v] as const)
        .reverse()
        .map(([k, v]) => `L${x(k).toFixed(1)},${y(v).toFixed(1)}`)
        .join('');
      for (let k = 0; k < lower.length; k++) lower[k] = upper[k];
      return { id: f.id, colour: fundColour(f.i), d: `${top}${bottom}Z` };
    });
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [weights, w, h]);

  const summaryYears = [fromYears, 20, 10, 0].filter((v, k, a) => v <= fromYears && a.indexOf(v) === k);
  const summary = glidePath.length
    ? summaryYears
        .map((yy) => {
          const wt = weightsAt(glidePath, ids, yy);
          return glideMixText(yy, funds.map((f, i) => ({ name: f.name, weight: wt[i] })));
        })
        .join('. ')
    : 'No points yet.';

  return (
    <View style={{ gap: space.sm }}>
      {!compact ? <Text style={[type.label, { color: colors.ink }]}>{title}</Text> : null}
      <View onLayout={(e) => setWidth(e.nativeEvent.layout.width)} accessibilityLabel={`${title}. ${summary}`} role="img">
        {width > 0 ? (
          <Svg width={width} height={height}>
            {!compact ? (
              <G>
                {share.ticks.map((v) => (
                  <G key={v}>
                    <Line x1={pad.left} x2={pad.left + w} y1={y(v)} y2={y(v)} stroke={colors.rule} strokeWidth={1} />
                    <SvgText x={pad.left - 6} y={y(v) + 4} fontSize={11} fill={colors.mutedInk} textAnchor="end">
                      {share.label(v)}
                    </SvgText>
                  </G>
                ))}
              </G>
            ) : null}
            {areas.map((a) => (
              <Path key={a.id} d={a.d} fill={a.colour} fillOpacity={0.85} stroke={colors.surface} strokeWidth={0.5} />
            ))}
            {!compact ? (
              <G>
                {wholeTicks(0, fromYears, 4)
                  .map((yy) => [yy, years.indexOf(yy)] as const)
                  .map(([yy, k]) => (
                    <SvgText key={yy} x={x(k)} y={pad.top + h + 14} fontSize={11} fill={colors.mutedInk} textAnchor="middle">
                      {String(yy)}
                    </SvgText>
                  ))}
                <SvgText x={pad.left + w / 2} y={height - 4} fontSize={11} fill={colors.mutedInk} textAnchor="middle">
                  Years to retirement
                </SvgText>
              </G>
            ) : null}
          </Svg>
        ) : (
          <View style={{ height }} />
        )}
      </View>
      {!compact ? (
        <>
          <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
            {used.map((f) => (
              <View key={f.id} style={{ flexDirection: 'row', alignItems: 'center', gap: 6 }}>
                <View style={{ width: 12, height: 12, borderRadius: 2, backgroundColor: fundColour(f.i) }} />
                <Text style={[type.caption, { color: colors.ink }]}>{f.name}</Text>
              </View>
            ))}
          </View>
          <Text style={[type.caption, { color: colors.mutedInk }]}>{summary}.</Text>
        </>
      ) : null}
    </View>
  );
}
