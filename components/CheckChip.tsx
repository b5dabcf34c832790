import { Pressable, Text } from 'react-native';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';

/** A chip that is ticked or not (a checkbox), with an optional warning note such as DRAFT. */
export function CheckChip({ label, selected, onPress, note }: { label: string; selected: boolean; onPress: () => void; note?: string }) {
  return (
    <Pressable
      role="checkbox"
      aria-checked={selected}
      aria-label={note ? `${label} (${note})` : label}
      onPress={onPress}
      style={{
        minHeight: MIN_TOUCH,
        paddingHorizontal: space.md,
        justifyContent: 'center',
        borderRadius: radius.md,
        borderWidth: 1,
        borderColor: selected ? colors.primary : '#B9B2A7',
        backgroundColor: selected ? colors.primaryTint : colors.surface,
      }}
    >
      <Text style={[type.label, { color: selected ? colors.primary : colors.ink }]}>
        {selected ? '✓ ' : ''}
        {label}
        {note ? <Text style={{ color: colors.danger }}> {note}</Text> : null}
      </Text>
    </Pressable>
  );
}
