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
  // ARIA props (not accessibilityState, which react-native-web no longer maps): a check box or radio is checked, a toggle pressed.
  const semantics = kind === 'toggle' ? ({ role: 'button', 'aria-pressed': selected } as const) : ({ role: kind === 'radio' ? 'radio' : 'checkbox', 'aria-checked': selected } as const);
  return (
    <Pressable
      {...semantics}
      aria-label={note ? `${label} (${note})` : label}
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
