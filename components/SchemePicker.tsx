import { Pressable, Text, View } from 'react-native';
import { ROLE_LABELS, type Role } from '@/constants/permissions';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';

type Scheme = { id: string; name: string; role: Role };

/** Choose which of your schemes is in view (for people with more than one). */
export function SchemePicker({ schemes, currentId, onChange }: { schemes: Scheme[]; currentId?: string; onChange: (id: string) => void }) {
  return (
    <View accessibilityRole="radiogroup" style={{ gap: space.sm }} testID="scheme-picker">
      {schemes.map((s) => {
        const on = s.id === currentId;
        return (
          <Pressable
            key={s.id}
            accessibilityRole="radio"
            accessibilityState={{ checked: on }}
            onPress={() => onChange(s.id)}
            style={{ minHeight: MIN_TOUCH, padding: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: on ? colors.primary : colors.rule, backgroundColor: on ? colors.primaryTint : colors.surface }}
          >
            <Text style={[type.label, { color: colors.ink }]}>{s.name}</Text>
            <Text style={[type.caption, { color: colors.mutedInk }]}>{ROLE_LABELS[s.role]}</Text>
          </Pressable>
        );
      })}
    </View>
  );
}
