import { Text, View } from 'react-native';
import Svg, { Path, Rect } from 'react-native-svg';
import { colors, fonts } from '@/constants/theme';

/** Keelson's mark: a hull-section keel line over a spruce block. */
export function Wordmark({ size = 'small', inverse }: { size?: 'small' | 'large'; inverse?: boolean }) {
  const s = size === 'large' ? 36 : 26;
  return (
    <View style={{ flexDirection: 'row', alignItems: 'center', gap: 10 }} accessibilityRole="header" accessibilityLabel="Keelson">
      <Svg width={s} height={s} viewBox="0 0 32 32">
        <Rect x={0} y={0} width={32} height={32} rx={7} fill={inverse ? colors.paper : colors.primary} />
        <Path d="M6 12h20l-4 9H10z" fill={inverse ? colors.primary : colors.paper} />
        <Path d="M15 21h2v6h-2z" fill={colors.accent} />
      </Svg>
      <Text style={{ fontFamily: fonts.bold, fontSize: size === 'large' ? 30 : 22, color: inverse ? colors.paper : colors.ink, letterSpacing: 0.3 }}>Keelson</Text>
    </View>
  );
}
