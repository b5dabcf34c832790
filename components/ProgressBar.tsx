import { Text, View } from 'react-native';
import { colors, radius, space, type } from '@/constants/theme';
import { percent } from '@/figures';

/** A determinate progress bar; `fraction` is 0…1. */
export function ProgressBar({ fraction, label }: { fraction: number; label: string }) {
  const pct = Math.round(Math.max(0, Math.min(1, fraction)) * 100);
  return (
    <View style={{ gap: space.xs }}>
      <View
        role="progressbar"
        aria-label={label}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct}
        testID="run-progress"
        style={{ height: 12, borderRadius: radius.sm, backgroundColor: colors.primaryTint, overflow: 'hidden' }}
      >
        <View style={{ width: `${pct}%`, height: '100%', backgroundColor: colors.primary }} />
      </View>
      <Text style={[type.caption, { color: colors.mutedInk }]}>
        {label}: {percent(Math.max(0, Math.min(1, fraction)), 'chance')}
      </Text>
    </View>
  );
}
