import { useState } from 'react';
import { Pressable, Text, TextInput, View, type TextStyle } from 'react-native';
import { colors, fundColour, MIN_TOUCH, radius, space, type } from '@/constants/theme';
import { parseNumberInput, parsePercentInput, percent, percentInputText } from '@/figures';
import { Button } from './ui';
import { rebalance } from './glideWeights';

export type EditablePoint = { yearsToRetirement: number; weights: Record<string, number> };

type Props = {
  funds: { id: string; name: string }[];
  points: EditablePoint[];
  onChange: (points: EditablePoint[]) => void;
  /** Problems per point from the form's schema (the API's own), shown beside the point. */
  errors?: ({ yearsToRetirement?: string; weights?: string } | undefined)[];
};

const figure: TextStyle = { ...type.figure, fontVariant: ['tabular-nums'] };

function WeightInput({ value, label, onCommit, colour }: { value: number; label: string; onCommit: (v: number) => void; colour: string }) {
  const [text, setText] = useState(percentInputText(value));
  const [shown, setShown] = useState(value);
  if (shown !== value) {
    setShown(value);
    setText(percentInputText(value));
  }
  const commit = () => {
    const v = parsePercentInput(text);
    if (v === null || v < 0 || v > 1) setText(percentInputText(value));
    else if (Math.abs(v - value) > 1e-12) onCommit(v);
  };
  return (
    <View style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm, minHeight: MIN_TOUCH }}>
      <View style={{ width: 10, height: 28, borderRadius: 2, backgroundColor: colour }} />
      <Text style={[type.body, { flex: 1, color: colors.ink, lineHeight: 20 }]} numberOfLines={2}>
        {label}
      </Text>
      <TextInput
        accessibilityLabel={`${label} weight, percent`}
        value={text}
        onChangeText={setText}
        onBlur={commit}
        onSubmitEditing={commit}
        inputMode="decimal"
        style={[figure, { width: 80, minHeight: MIN_TOUCH, textAlign: 'right', borderWidth: 1, borderColor: colors.inputBorder, borderRadius: radius.sm, paddingHorizontal: space.sm, color: colors.ink, backgroundColor: colors.surface }]}
      />
      <Text style={[type.body, { color: colors.mutedInk, width: 16 }]}>%</Text>
    </View>
  );
}

/**
 * Glide-path points, each with its years to retirement and a weight per fund. Changing a
 * weight rebalances the point's other weights so every point always sums to 100%.
 */
export function GlidePathEditor({ funds, points, onChange, errors }: Props) {
  const ids = funds.map((f) => f.id);
  const [yearsText, setYearsText] = useState(points.map((p) => String(p.yearsToRetirement)));
  const [shown, setShown] = useState(points);
  if (shown !== points) {
    setShown(points);
    setYearsText(points.map((p) => String(p.yearsToRetirement)));
  }

  const setPoint = (k: number, p: EditablePoint) => onChange(points.map((q, i) => (i === k ? p : q)));
  const addPoint = () => {
    const taken = new Set(points.map((p) => p.yearsToRetirement));
    const last = points[points.length - 1];
    let years = last ? Math.max(0, last.yearsToRetirement - 5) : 0;
    while (taken.has(years) && years < 100) years++;
    onChange([...points, { yearsToRetirement: years, weights: last ? { ...last.weights } : { [ids[0]]: 1 } }]);
  };

  return (
    <View style={{ gap: space.md }}>
      {points.map((p, k) => {
        const total = ids.reduce((s, f) => s + (p.weights[f] ?? 0), 0);
        const ok = Math.abs(total - 1) < 1e-9;
        const commitYears = () => {
          const v = parseNumberInput(yearsText[k] ?? '');
          if (v === null || v < 0 || v > 100) setYearsText(points.map((q) => String(q.yearsToRetirement)));
          else if (v !== p.yearsToRetirement) setPoint(k, { ...p, yearsToRetirement: v });
        };
        return (
          <View key={k} testID={`glide-point-${k}`} style={{ borderWidth: 1, borderColor: colors.rule, borderRadius: radius.md, padding: space.md, gap: space.xs, backgroundColor: colors.surface }}>
            <View style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm, flexWrap: 'wrap' }}>
              <TextInput
                accessibilityLabel={`Point ${k + 1}: years to retirement`}
                value={yearsText[k] ?? ''}
                onChangeText={(s) => setYearsText(yearsText.map((t, i) => (i === k ? s : t)))}
                onBlur={commitYears}
                onSubmitEditing={commitYears}
                inputMode="decimal"
                style={[figure, { width: 64, minHeight: MIN_TOUCH, textAlign: 'right', borderWidth: 1, borderColor: colors.inputBorder, borderRadius: radius.sm, paddingHorizontal: space.sm, color: colors.ink }]}
              />
              <Text style={[type.label, { color: colors.ink, flex: 1 }]}>years to retirement</Text>
              <Text style={[type.caption, { color: ok ? colors.success : colors.danger }]}>Total {percent(total, 'rate')}</Text>
              {points.length > 1 ? (
                <Pressable accessibilityRole="button" accessibilityLabel={`Remove point ${k + 1}`} onPress={() => onChange(points.filter((_, i) => i !== k))} style={{ minHeight: MIN_TOUCH, minWidth: MIN_TOUCH, alignItems: 'center', justifyContent: 'center' }}>
                  <Text style={[type.label, { color: colors.danger }]}>Remove</Text>
                </Pressable>
              ) : null}
            </View>
            {errors?.[k]?.yearsToRetirement ? (
              <Text role="alert" style={[type.caption, { color: colors.danger }]}>
                Years to retirement: {errors[k]!.yearsToRetirement}
              </Text>
            ) : null}
            {funds.map((f, i) => (
              <WeightInput key={f.id} label={f.name} colour={fundColour(i)} value={p.weights[f.id] ?? 0} onCommit={(v) => setPoint(k, { ...p, weights: rebalance(p.weights, ids, f.id, v) })} />
            ))}
            {errors?.[k]?.weights ? (
              <Text role="alert" style={[type.caption, { color: colors.danger }]}>
                Weights: {errors[k]!.weights}
              </Text>
            ) : null}
          </View>
        );
      })}
      <View style={{ flexDirection: 'row' }}>
        <Button label="Add a point" kind="secondary" onPress={addPoint} />
      </View>
      <Text style={[type.caption, { color: colors.mutedInk }]}>
        Changing one weight moves the others in proportion, so each point always adds up to 100%. Between points the mix moves in a straight line; before the first point and after the last, their mix is held.
      </Text>
    </View>
  );
}
