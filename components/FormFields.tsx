import { useState } from 'react';
import { Text, TextInput, View, type TextInputProps } from 'react-native';
import { useController, type Control, type FieldPath, type FieldValues, type UseFormSetError } from 'react-hook-form';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';
import { parseNumberInput, parsePercentInput, percentInputText } from '@/figures';
import { Field } from './ui';

/**
 * Form fields bound to react-hook-form. The form validates with the same zod schema as the API
 * (schemas/), so a message beside a field reads as the server's would. Numbers typed as
 * percentages are turned into fractions here, at the edge, without floating-point noise
 * (figures/numbers.ts: "0.45" → exactly 0.0045).
 */
type Bound<T extends FieldValues> = { control: Control<T>; name: FieldPath<T>; label: string; hint?: string; testID?: string };

export function TextField<T extends FieldValues>({ control, name, label, hint, testID, ...input }: Bound<T> & Omit<TextInputProps, 'value' | 'onChangeText'>) {
  const { field, fieldState } = useController({ control, name });
  return <Field label={label} hint={hint} testID={testID} value={String(field.value ?? '')} onChangeText={field.onChange} onBlur={field.onBlur} error={fieldState.error?.message} {...input} />;
}

/**
 * A number typed as text: the form holds the number (NaN while the text is not one), the box
 * keeps what was typed. `read`/`write` convert between the two.
 */
function useNumberText<T extends FieldValues>(control: Control<T>, name: FieldPath<T>, read: (s: string) => number | null, write: (v: number) => string, notANumber: string) {
  const { field, fieldState } = useController({ control, name });
  const value = field.value as number;
  const [text, setText] = useState(() => (Number.isFinite(value) ? write(value) : ''));
  const [shown, setShown] = useState<number>(value);
  // The value changed from outside (a reset, a suggestion adopted): show it.
  if (!Object.is(value, shown)) {
    setShown(value);
    if (!Object.is(read(text) ?? Number.NaN, value)) setText(Number.isFinite(value) ? write(value) : '');
  }
  const onChangeText = (t: string) => {
    setText(t);
    const v = read(t) ?? Number.NaN;
    setShown(v);
    field.onChange(v);
  };
  const unreadable = read(text) === null;
  return { text, onChangeText, onBlur: field.onBlur, error: unreadable && (text.trim() !== '' || fieldState.isTouched || !!fieldState.error) ? notANumber : fieldState.error?.message };
}

/** A percentage box for a fraction field (label "… (%)"). */
export function PercentField<T extends FieldValues>({ control, name, label, hint, testID, compact }: Bound<T> & { compact?: boolean }) {
  const n = useNumberText(control, name, parsePercentInput, percentInputText, 'enter a percentage, e.g. 2.5');
  if (compact) return <CompactInput label={label} text={n.text} onChangeText={n.onChangeText} onBlur={n.onBlur} error={n.error} testID={testID} />;
  return <Field label={label} hint={hint} testID={testID} value={n.text} onChangeText={n.onChangeText} onBlur={n.onBlur} error={n.error} inputMode="decimal" />;
}

/** A plain number box (years, seed, λ). */
export function NumberField<T extends FieldValues>({ control, name, label, hint, testID, integer }: Bound<T> & { integer?: boolean }) {
  const n = useNumberText(control, name, parseNumberInput, (v) => String(v), integer ? 'enter a whole number' : 'enter a number');
  return <Field label={label} hint={hint} testID={testID} value={n.text} onChangeText={n.onChangeText} onBlur={n.onBlur} error={n.error} inputMode={integer ? 'numeric' : 'decimal'} />;
}

/** A narrow right-aligned box for tables of figures; its label is spoken, not shown. */
function CompactInput({ label, text, onChangeText, onBlur, error, testID }: { label: string; text: string; onChangeText: (t: string) => void; onBlur: () => void; error?: string; testID?: string }) {
  return (
    <View style={{ width: 96 }}>
      <TextInput
        accessibilityLabel={label}
        testID={testID}
        value={text}
        onChangeText={onChangeText}
        onBlur={onBlur}
        inputMode="decimal"
        style={[type.body, { minHeight: MIN_TOUCH, textAlign: 'right', borderWidth: 1, borderColor: error ? colors.danger : colors.inputBorder, borderRadius: radius.sm, paddingHorizontal: space.sm, color: colors.ink, backgroundColor: colors.surface }]}
      />
      {error ? (
        <Text role="alert" style={[type.caption, { color: colors.danger }]}>
          {error}
        </Text>
      ) : null}
    </View>
  );
}

/**
 * Puts the API's field problems (a 400's issues, paths like "funds.0.expectedReturn") beside the
 * fields they name; returns those that name no field of the form, for a notice.
 */
export function showServerIssues<T extends FieldValues>(error: unknown, setError: UseFormSetError<T>, fields: (path: string) => boolean): { path: string; message: string }[] {
  const issues = ((error as { issues?: { path: string; message: string }[] } | null)?.issues ?? []).filter((i) => typeof i.path === 'string');
  const elsewhere: { path: string; message: string }[] = [];
  for (const i of issues) {
    if (fields(i.path)) setError(i.path as FieldPath<T>, { type: 'server', message: i.message });
    else elsewhere.push(i);
  }
  return elsewhere;
}
