import Svg, { Circle, Line, Path, Rect } from 'react-native-svg';
import type { OptionStyle } from '@/constants/theme';

/**
 * An option's own mark — a short line in its colour and dash with its marker — drawn beside its
 * name wherever options are compared (the PDFs draw the same mark: server/reports/draw.ts).
 */
export function OptionMark({ style, size = 14 }: { style: OptionStyle; size?: number }) {
  const w = size * 2;
  const cy = size / 2;
  const cx = w / 2;
  const r = size / 4.5;
  const stroke = style.colour;
  return (
    <Svg width={w} height={size} accessible={false}>
      <Line x1={0} x2={w} y1={cy} y2={cy} stroke={stroke} strokeWidth={2} strokeDasharray={style.dash.length ? style.dash.join(' ') : undefined} />
      {style.marker === 'circle' ? <Circle cx={cx} cy={cy} r={r} fill={stroke} /> : null}
      {style.marker === 'ring' ? <Circle cx={cx} cy={cy} r={r} fill="none" stroke={stroke} strokeWidth={1.5} /> : null}
      {style.marker === 'square' ? <Rect x={cx - r} y={cy - r} width={2 * r} height={2 * r} fill={stroke} /> : null}
      {style.marker === 'triangle' ? <Path d={`M${cx},${cy - r - 0.5}L${cx + r},${cy + r - 0.5}L${cx - r},${cy + r - 0.5}Z`} fill={stroke} /> : null}
      {style.marker === 'diamond' ? <Path d={`M${cx},${cy - r - 1}L${cx + r + 1},${cy}L${cx},${cy + r + 1}L${cx - r - 1},${cy}Z`} fill={stroke} /> : null}
      {style.marker === 'cross' ? <Path d={`M${cx - r},${cy - r}L${cx + r},${cy + r}M${cx + r},${cy - r}L${cx - r},${cy + r}`} stroke={stroke} strokeWidth={1.8} /> : null}
    </Svg>
  );
}
