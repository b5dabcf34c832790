import { Pressable, Text, View } from 'react-native';
import { ROLES, ROLE_LABELS, type Role } from '@/constants/permissions';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';

/** One role out of the five, as a row of chips that wraps on phones. */
export function RolePicker({ value, onChange, label = 'Role' }: { value: Role; onChange: (r: Role) => void; label?: string }) {
  return (
    <View style={{ marginBottom: space.md }}>
      <Text style={[type.label, { color: colors.ink, marginBottom: space.xs }]}>{label}</Text>
      <View accessibilityRole="radiogroup" accessibilityLabel={label} style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }}>
        {ROLES.map((r) => {
          const on = r === value;
          return (
            <Pressable
              key={r}
              accessibilityRole="radio"
              accessibilityState={{ checked: on }}
              onPress={() => onChange(r)}
              style={{ minHeight: MIN_TOUCH, justifyContent: 'center', paddingHorizontal: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: on ? colors.primary : colors.rule, backgroundColor: on ? colors.primary : colors.surface }}
            >
              <Text style={[type.label, { color: on ? colors.onPrimary : colors.ink }]}>{ROLE_LABELS[r]}</Text>
            </Pressable>
          );
        })}
      </View>
    </View>
  );
}
