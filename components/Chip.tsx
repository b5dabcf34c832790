import { Pressable, Text } from 'react-native';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';

/**
 * A chip that is on or off: `check` for picking items of a list (a tick and a tint when on,
 * an optional warning note), `toggle` for switching a view (filled when on).
 */
export function Chip({ label, selected, onPress, note, kind = 'check' }: { label: string; selected: boolean; onPress: () => void; note?: string; kind?: 'check' | 'toggle' }) {
  const check = kind === 'check';
  const border = selected || !check ? colors.primary : colors.inputBorder;
  const background = selected ? (check ? colors.primaryTint : colors.primary) : colors.surface;
  const ink = selected ? (check ? colors.primary : colors.onPrimary) : check ? colors.ink : colors.primary;
  return (
    <Pressable
      accessibilityRole={check ? 'checkbox' : 'button'}
      accessibilityState={check ? { checked: selected } : { selected }}
      accessibilityLabel={note ? `${label} (${note})` : label}
      onPress={onPress}
      style={{ minHeight: MIN_TOUCH, paddingHorizontal: space.md, justifyContent: 'center', borderRadius: radius.md, borderWidth: 1, borderColor: border, backgroundColor: background }}
    >
      <Text style={[type.label, { color: ink }]}>
        {check && selected ? '✓ ' : ''}
        {label}
        {note ? <Text style={{ color: colors.danger }}> {note}</Text> : null}
      </Text>
    </Pressable>
  );
}
