import { Pressable, Text } from 'react-native';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';

/**
 * A chip that is on or off: `check` for picking items of a list (a tick and a tint when on,
 * an optional warning note), `radio` for picking one of a group (a tint when on; put the chips
 * in a `role="radiogroup"` view), `toggle` for switching a view (filled when on).
 */
export function Chip({ label, selected, onPress, note, kind = 'check', testID }: { label: string; selected: boolean; onPress: () => void; note?: string; kind?: 'check' | 'radio' | 'toggle'; testID?: string }) {
  const pick = kind !== 'toggle';
  const border = selected || !pick ? colors.primary : colors.inputBorder;
  const background = selected ? (pick ? colors.primaryTint : colors.primary) : colors.surface;
  const ink = selected ? (pick ? colors.primary : colors.onPrimary) : pick ? colors.ink : colors.primary;
  const semantics =
    kind === 'radio'
      ? ({ role: 'radio', 'aria-checked': selected } as const)
      : { accessibilityRole: kind === 'check' ? ('checkbox' as const) : ('button' as const), accessibilityState: kind === 'check' ? { checked: selected } : { selected } };
  return (
    <Pressable
      {...semantics}
      accessibilityLabel={note ? `${label} (${note})` : label}
      onPress={onPress}
      testID={testID}
      style={{ minHeight: MIN_TOUCH, paddingHorizontal: space.md, justifyContent: 'center', borderRadius: radius.md, borderWidth: 1, borderColor: border, backgroundColor: background }}
    >
      <Text style={[type.label, { color: ink }]}>
        {kind === 'check' && selected ? '✓ ' : ''}
        {label}
        {note ? <Text style={{ color: colors.danger }}> {note}</Text> : null}
      </Text>
    </Pressable>
  );
}
