import type { ReactNode } from 'react';
import { ActivityIndicator, Pressable, ScrollView, StyleSheet, Text, TextInput, View, type TextInputProps, type ViewStyle } from 'react-native';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';

export function Screen({ title, subtitle, children, actions }: { title: string; subtitle?: string; children: ReactNode; actions?: ReactNode }) {
  return (
    <ScrollView style={styles.screen} contentContainerStyle={styles.screenContent}>
      <View style={styles.screenHeader}>
        <View style={{ flex: 1, minWidth: 200 }}>
          <Text accessibilityRole="header" style={styles.heading}>
            {title}
          </Text>
          {subtitle ? <Text style={styles.muted}>{subtitle}</Text> : null}
        </View>
        {actions ? <View style={styles.row}>{actions}</View> : null}
      </View>
      {children}
    </ScrollView>
  );
}

export function Card({ title, children, style }: { title?: string; children: ReactNode; style?: ViewStyle }) {
  return (
    <View style={[styles.card, style]}>
      {title ? (
        <Text accessibilityRole="header" style={styles.cardTitle}>
          {title}
        </Text>
      ) : null}
      {children}
    </View>
  );
}

type ButtonProps = { label: string; onPress: () => void; kind?: 'primary' | 'secondary' | 'danger'; disabled?: boolean; busy?: boolean; testID?: string };
export function Button({ label, onPress, kind = 'primary', disabled, busy, testID }: ButtonProps) {
  const off = disabled || busy;
  return (
    <Pressable
      testID={testID}
      accessibilityRole="button"
      accessibilityState={{ disabled: !!off, busy: !!busy }}
      disabled={off}
      onPress={onPress}
      style={({ pressed }) => [
        styles.button,
        kind === 'primary' && { backgroundColor: pressed ? colors.primaryPressed : colors.primary },
        kind === 'secondary' && styles.buttonSecondary,
        kind === 'danger' && { backgroundColor: colors.danger },
        off && { opacity: 0.55 },
      ]}
    >
      {busy ? <ActivityIndicator color={kind === 'secondary' ? colors.primary : colors.onPrimary} style={{ marginRight: space.sm }} /> : null}
      <Text style={[styles.buttonLabel, kind === 'secondary' && { color: colors.primary }]}>{label}</Text>
    </Pressable>
  );
}

type FieldProps = TextInputProps & { label: string; error?: string; hint?: string; testID?: string };
export function Field({ label, error, hint, style, ...input }: FieldProps) {
  return (
    <View style={{ marginBottom: space.md }}>
      <Text style={styles.label}>{label}</Text>
      <TextInput
        accessibilityLabel={label}
        placeholderTextColor={colors.mutedInk}
        style={[styles.input, error ? { borderColor: colors.danger } : null, style]}
        {...input}
      />
      {error ? (
        <Text role="alert" style={styles.error}>
          {error}
        </Text>
      ) : hint ? (
        <Text style={styles.muted}>{hint}</Text>
      ) : null}
    </View>
  );
}

export function Notice({ tone = 'info', children }: { tone?: 'info' | 'error' | 'success' | 'warning'; children: ReactNode }) {
  const bg = { info: colors.primaryTint, error: colors.dangerTint, success: colors.successTint, warning: colors.accentTint }[tone];
  const fg = { info: colors.primary, error: colors.danger, success: colors.success, warning: colors.accentInk }[tone];
  return (
    <View role={tone === 'error' ? 'alert' : undefined} style={[styles.notice, { backgroundColor: bg, borderLeftColor: fg }]}>
      {typeof children === 'string' ? <Text style={[type.body, { color: colors.ink }]}>{children}</Text> : children}
    </View>
  );
}

export function Loading({ label = 'Loading…' }: { label?: string }) {
  return (
    <View style={{ padding: space.xl, alignItems: 'center' }}>
      <ActivityIndicator color={colors.primary} />
      <Text style={[styles.muted, { marginTop: space.sm }]}>{label}</Text>
    </View>
  );
}

export const styles = StyleSheet.create({
  screen: { flex: 1, backgroundColor: colors.paper },
  screenContent: { padding: space.lg, paddingBottom: space.xxl * 2, gap: space.lg, maxWidth: 1200, width: '100%', alignSelf: 'center' },
  screenHeader: { flexDirection: 'row', flexWrap: 'wrap', alignItems: 'flex-end', gap: space.md },
  heading: { ...type.heading, color: colors.ink },
  muted: { ...type.caption, color: colors.mutedInk },
  body: { ...type.body, color: colors.ink },
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' },
  card: { backgroundColor: colors.surface, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.rule, padding: space.lg, gap: space.sm },
  cardTitle: { ...type.title, color: colors.ink, marginBottom: space.xs },
  button: {
    minHeight: MIN_TOUCH,
    paddingHorizontal: space.lg,
    borderRadius: radius.md,
    alignItems: 'center',
    justifyContent: 'center',
    flexDirection: 'row',
  },
  buttonSecondary: { backgroundColor: colors.surface, borderWidth: 1, borderColor: colors.primary },
  buttonLabel: { ...type.label, fontSize: 16, color: colors.onPrimary },
  label: { ...type.label, color: colors.ink, marginBottom: space.xs },
  input: {
    ...type.body,
    minHeight: MIN_TOUCH,
    borderWidth: 1,
    borderColor: colors.inputBorder,
    borderRadius: radius.md,
    paddingHorizontal: space.md,
    backgroundColor: colors.surface,
    color: colors.ink,
  },
  error: { ...type.caption, color: colors.danger, marginTop: space.xs },
  notice: { borderLeftWidth: 4, borderRadius: radius.sm, padding: space.md },
});
