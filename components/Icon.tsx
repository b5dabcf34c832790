import Svg, { Path, Circle, Rect } from 'react-native-svg';
import { colors } from '@/constants/theme';

export type IconName = 'home' | 'chart' | 'sliders' | 'path' | 'people' | 'person' | 'log' | 'document' | 'signout' | 'upload' | 'pie' | 'card' | 'more' | 'seal' | 'gear';

/** Small line icons drawn with react-native-svg (24-unit grid, 1.8 stroke). */
export function Icon({ name, size = 22, color = colors.ink }: { name: IconName; size?: number; color?: string }) {
  const p = { stroke: color, strokeWidth: 1.8, fill: 'none', strokeLinecap: 'round' as const, strokeLinejoin: 'round' as const };
  return (
    <Svg width={size} height={size} viewBox="0 0 24 24" accessibilityElementsHidden importantForAccessibility="no">
      {name === 'home' && <Path d="M3 11l9-7 9 7v9a1 1 0 0 1-1 1h-5v-6H9v6H4a1 1 0 0 1-1-1z" {...p} />}
      {name === 'chart' && <Path d="M3 20h18M5 16l4-5 4 3 6-8" {...p} />}
      {name === 'sliders' && <Path d="M4 6h10M18 6h2M4 12h4M12 12h8M4 18h12M20 18h0M14 4v4M8 10v4M16 16v4" {...p} />}
      {name === 'path' && <Path d="M3 5h6c3 0 3 14 6 14h6M3 19h18" {...p} />}
      {name === 'people' && (
        <>
          <Circle cx={9} cy={8} r={3.2} {...p} />
          <Path d="M3 20c0-3.5 2.7-6 6-6s6 2.5 6 6M16 5.2a3 3 0 0 1 0 5.6M17.5 14.3c2 .7 3.5 2.8 3.5 5.7" {...p} />
        </>
      )}
      {name === 'person' && (
        <>
          <Circle cx={12} cy={8} r={3.5} {...p} />
          <Path d="M5 20c0-3.9 3.1-7 7-7s7 3.1 7 7" {...p} />
        </>
      )}
      {name === 'log' && <Path d="M6 3h9l4 4v14H6zM9 10h7M9 14h7M9 18h4" {...p} />}
      {name === 'document' && (
        <>
          <Rect x={5} y={3} width={14} height={18} rx={1.5} {...p} />
          <Path d="M8.5 8h7M8.5 12h7M8.5 16h4" {...p} />
        </>
      )}
      {name === 'signout' && <Path d="M14 4h5v16h-5M10 8l-4 4 4 4M6 12h10" {...p} />}
      {name === 'upload' && <Path d="M12 16V4M7 9l5-5 5 5M4 20h16" {...p} />}
      {name === 'more' && (
        <>
          <Circle cx={5} cy={12} r={1.4} {...p} />
          <Circle cx={12} cy={12} r={1.4} {...p} />
          <Circle cx={19} cy={12} r={1.4} {...p} />
        </>
      )}
      {name === 'seal' && (
        <>
          <Circle cx={12} cy={9} r={5.5} {...p} />
          <Path d="M9.5 9l1.8 1.8L14.8 7.3M8.5 13.5L7 21l5-2.5 5 2.5-1.5-7.5" {...p} />
        </>
      )}
      {name === 'gear' && (
        <>
          <Circle cx={12} cy={12} r={3} {...p} />
          <Path d="M12 2.8v2.6M12 18.6v2.6M2.8 12h2.6M18.6 12h2.6M5.5 5.5l1.8 1.8M16.7 16.7l1.8 1.8M5.5 18.5l1.8-1.8M16.7 7.3l1.8-1.8" {...p} />
        </>
      )}
      {name === 'pie' && <Path d="M12 3a9 9 0 1 0 9 9h-9zM15 3.5A9 9 0 0 1 20.5 9H15z" {...p} />}
      {name === 'card' && (
        <>
          <Rect x={3} y={5} width={18} height={14} rx={2} {...p} />
          <Circle cx={8.5} cy={11} r={2} {...p} />
          <Path d="M5.5 16c.6-1.6 1.7-2.4 3-2.4s2.4.8 3 2.4M14 10h4M14 13.5h4" {...p} />
        </>
      )}
    </Svg>
  );
}
