import { useState } from 'react';
import { Pressable, Text, TextInput, View } from 'react-native';
import { lambdaFromGamble } from '@/simulation';
import { BOARD_LAMBDA, clampLambda } from '@/constants/riskAversion';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';
import { Button, styles } from './ui';
import { lambda as lambdaText, money, parseNumberInput } from '@/figures';

const clamp = clampLambda;

/** The board's risk aversion λ: presets, a stepper and a typed value, plus a calibration by a stated gamble. */
export function LambdaControl({ value, onChange, currency }: { value: number; onChange: (v: number) => void; currency: string }) {
  const [text, setText] = useState<string | null>(null);
  const shown = text ?? lambdaText(value).replace('−', '-');
  return (
    <View style={{ gap: space.sm }}>
      <Text style={styles.body}>
        λ sets how much the board dislikes a spread of outcomes. At 0 only the average pot counts (risk-neutral); higher values weigh poor outcomes more heavily; below 0 the board would prefer a wider spread (risk-seeking).
      </Text>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' }}>
        <Step label="−" a11y={`Lower λ by ${BOARD_LAMBDA.step}`} onPress={() => onChange(clamp(value - BOARD_LAMBDA.step))} />
        <TextInput
          accessibilityLabel="Risk aversion λ"
          value={shown}
          inputMode="decimal"
          onChangeText={setText}
          onBlur={() => {
            const v = Number(shown);
            if (shown.trim() !== '' && Number.isFinite(v)) onChange(clamp(v));
            setText(null);
          }}
          onSubmitEditing={() => {
            const v = Number(shown);
            if (shown.trim() !== '' && Number.isFinite(v)) onChange(clamp(v));
            setText(null);
          }}
          style={[styles.input, { width: 80, textAlign: 'center' }]}
        />
        <Step label="+" a11y={`Raise λ by ${BOARD_LAMBDA.step}`} onPress={() => onChange(clamp(value + BOARD_LAMBDA.step))} />
        {BOARD_LAMBDA.presets.map((p) => (
          <Pressable
            key={p}
            accessibilityRole="button"
            accessibilityLabel={`λ ${p}`}
            accessibilityState={{ selected: p === value }}
            onPress={() => onChange(p)}
            style={{
              minHeight: MIN_TOUCH,
              minWidth: MIN_TOUCH,
              paddingHorizontal: space.sm,
              borderRadius: radius.md,
              borderWidth: 1,
              borderColor: colors.primary,
              backgroundColor: p === value ? colors.primary : colors.surface,
              alignItems: 'center',
              justifyContent: 'center',
            }}
          >
            <Text style={[type.label, { color: p === value ? colors.onPrimary : colors.primary }]}>{p}</Text>
          </Pressable>
        ))}
      </View>
      <Calibrate currency={currency} onUse={onChange} />
    </View>
  );
}

function Step({ label, a11y, onPress }: { label: string; a11y: string; onPress: () => void }) {
  return (
    <Pressable
      accessibilityRole="button"
      accessibilityLabel={a11y}
      onPress={onPress}
      style={{ width: MIN_TOUCH, height: MIN_TOUCH, borderRadius: radius.md, borderWidth: 1, borderColor: colors.primary, alignItems: 'center', justifyContent: 'center' }}
    >
      <Text style={[type.title, { color: colors.primary }]}>{label}</Text>
    </Pressable>
  );
}

/** The board states the smallest win that would make an even-odds gamble acceptable; Keelson gives the λ. */
function Calibrate({ currency, onUse }: { currency: string; onUse: (v: number) => void }) {
  const [open, setOpen] = useState(false);
  const [pot, setPot] = useState('200000');
  const [loss, setLoss] = useState('40000');
  const [gain, setGain] = useState('60000');
  if (!open) return <Button kind="secondary" label="Calibrate λ from a gamble" onPress={() => setOpen(true)} />;
  let answer: { lambda: number } | { error: string };
  try {
    answer = { lambda: lambdaFromGamble({ pot: parseNumberInput(pot) ?? Number.NaN, loss: parseNumberInput(loss) ?? Number.NaN, gain: parseNumberInput(gain) ?? Number.NaN }) };
  } catch (e) {
    answer = { error: (e as Error).message };
  }
  return (
    <View style={{ gap: space.sm, borderTopWidth: 1, borderColor: colors.rule, paddingTop: space.sm }}>
      <Text style={styles.body}>
        A member has a pot of {money(parseNumberInput(pot) ?? 0, currency, 'entered')}. A coin toss would cost {money(parseNumberInput(loss) ?? 0, currency, 'entered')} on tails. How much would heads have to win before the board would accept the toss?
      </Text>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }}>
        <Num label="Pot" value={pot} onChange={setPot} />
        <Num label="Loss on tails" value={loss} onChange={setLoss} />
        <Num label="Smallest acceptable win on heads" value={gain} onChange={setGain} />
      </View>
      {'lambda' in answer ? (
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', gap: space.md }}>
          <Text style={styles.body} testID="calibrated-lambda">
            That answer corresponds to λ = {lambdaText(answer.lambda)}.
          </Text>
          <Button label="Use this λ" onPress={() => onUse(clamp(answer.lambda))} />
        </View>
      ) : (
        <Text style={[type.caption, { color: colors.danger }]} role="alert">
          {answer.error}
        </Text>
      )}
    </View>
  );
}

function Num({ label, value, onChange }: { label: string; value: string; onChange: (v: string) => void }) {
  return (
    <View style={{ minWidth: 140, flexGrow: 1 }}>
      <Text style={styles.label}>{label}</Text>
      <TextInput accessibilityLabel={label} value={value} onChangeText={onChange} inputMode="numeric" style={styles.input} />
    </View>
  );
}
