import { Text, View } from 'react-native';
import { colors, radius, space, type } from '@/constants/theme';

const TONES = {
  primary: [colors.primaryTint, colors.primary],
  success: [colors.successTint, colors.success],
  warning: [colors.accentTint, colors.accentInk],
  danger: [colors.dangerTint, colors.danger],
} as const;

/** A short label on a tinted ground: "Current default", "Signed off", "2 of 2 signatures". */
export function Tag({ label, tone = 'primary', testID }: { label: string; tone?: keyof typeof TONES; testID?: string }) {
  const [bg, fg] = TONES[tone];
  return (
    <View testID={testID} style={{ alignSelf: 'flex-start', paddingHorizontal: space.sm, paddingVertical: 2, borderRadius: radius.sm, backgroundColor: bg }}>
      <Text style={[type.label, { color: fg }]}>{label}</Text>
    </View>
  );
}
