import { Pressable, Text, View } from 'react-native';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';

/** A single choice among a few labelled options, as a wrapping row of radio chips. */
export function Choices<T extends string>({ label, options, value, onChange, testID }: { label: string; options: { value: T; label: string; hint?: string }[]; value: T | null; onChange: (v: T) => void; testID?: string }) {
  return (
    <View style={{ gap: space.xs }} testID={testID}>
      <Text style={[type.label, { color: colors.ink }]}>{label}</Text>
      <View role="radiogroup" aria-label={label} style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }}>
        {options.map((o) => {
          const on = o.value === value;
          return (
            <Pressable
              key={o.value}
              role="radio"
              aria-checked={on}
              aria-label={o.label}
              onPress={() => onChange(o.value)}
              style={{ minHeight: MIN_TOUCH, justifyContent: 'center', paddingHorizontal: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: on ? colors.primary : colors.rule, backgroundColor: on ? colors.primaryTint : colors.surface }}
            >
              <Text style={[type.label, { color: on ? colors.primary : colors.ink }]}>{o.label}</Text>
              {o.hint ? <Text style={[type.caption, { color: colors.mutedInk }]}>{o.hint}</Text> : null}
            </Pressable>
          );
        })}
      </View>
    </View>
  );
}
