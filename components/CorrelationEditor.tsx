import { useMemo, useState } from 'react';
import { ScrollView, Text, TextInput, View, type TextStyle } from 'react-native';
import { checkCorrelationMatrix, type CorrelationProblem } from '@/simulation';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';
import { decimal } from '@/figures';

type Props = {
  /** Row and column names, in matrix order. */
  names: string[];
  matrix: number[][];
  /** Without onChange the matrix is shown read-only. */
  onChange?: (matrix: number[][]) => void;
  /** Entries to tint as differing from another matrix, keyed "i,j". */
  highlight?: Set<string>;
  testID?: string;
};

const CELL = 72;
const toText = (m: number[][]) => m.map((r) => r.map((v) => String(v)));
const figure: TextStyle = { ...type.figure, fontVariant: ['tabular-nums'] };

/** Short column heading from a fund name: its initials ("Global Equity" → "GE"). */
function initials(name: string) {
  const words = name.replace(/^Fernleigh\s+/i, '').split(/\s+/).filter(Boolean);
  return words.map((w) => w[0]!.toUpperCase()).join('').slice(0, 3) || name.slice(0, 3);
}

/**
 * A correlation matrix: the diagonal is fixed at 1 and editing an entry above the diagonal
 * sets its mirror below, so the matrix stays symmetric. Every problem the engine's check
 * finds (range, diagonal, symmetry, positive semidefiniteness with its eigenvalue) is shown
 * beside the grid and tints the entries at fault.
 */
export function CorrelationEditor({ names, matrix, onChange, highlight, testID }: Props) {
  const n = names.length;
  const [text, setText] = useState<string[][]>(() => toText(matrix));
  // Re-read the entries when the matrix comes from outside (not from our own edit), without an effect.
  const [source, setSource] = useState(matrix);
  const [emitted, setEmitted] = useState<number[][] | null>(null);
  if (matrix !== source) {
    setSource(matrix);
    if (matrix !== emitted) setText(toText(matrix));
  }
  const problems = useMemo<CorrelationProblem[]>(() => checkCorrelationMatrix(matrix), [matrix]);
  const bad = new Set(problems.filter((p) => p.path.length === 2).flatMap((p) => [`${p.path[0]},${p.path[1]}`, `${p.path[1]},${p.path[0]}`]));
  const short = names.map(initials);

  const edit = (i: number, j: number, s: string) => {
    const t = text.map((r) => r.slice());
    t[i][j] = s;
    t[j][i] = s;
    setText(t);
    const v = s.trim() === '' || s.trim() === '-' ? NaN : Number(s);
    const m = matrix.map((r) => r.slice());
    m[i][j] = v;
    m[j][i] = v;
    setEmitted(m);
    onChange?.(m);
  };

  return (
    <View style={{ gap: space.sm }} testID={testID}>
      <ScrollView horizontal>
        <View role="table" aria-label="Correlation matrix">
          <View role="row" style={{ flexDirection: 'row' }}>
            <View style={{ width: 150 }} />
            {short.map((s, j) => (
              <View key={j} role="columnheader" style={{ width: CELL, alignItems: 'center', paddingVertical: space.xs }}>
                <Text style={[type.label, { color: colors.mutedInk }]} accessibilityLabel={names[j]}>
                  {s}
                </Text>
              </View>
            ))}
          </View>
          {matrix.map((row, i) => (
            <View key={i} role="row" style={{ flexDirection: 'row', alignItems: 'center' }}>
              <View role="rowheader" style={{ width: 150, paddingRight: space.sm }}>
                <Text numberOfLines={2} style={[type.caption, { color: colors.ink }]}>
                  {short[i]} · {names[i]}
                </Text>
              </View>
              {row.map((v, j) => {
                const key = `${i},${j}`;
                const fault = bad.has(key);
                const tint = fault ? colors.dangerTint : highlight?.has(key) ? colors.accentTint : i === j ? colors.paper : colors.surface;
                const editable = !!onChange && j > i;
                return (
                  <View key={j} role="cell" style={{ width: CELL, padding: 2 }}>
                    {editable ? (
                      <TextInput
                        value={text[i]?.[j] ?? ''}
                        onChangeText={(s) => edit(i, j, s)}
                        inputMode="decimal"
                        accessibilityLabel={`Correlation of ${names[i]} with ${names[j]}`}
                        style={[figure, { minHeight: MIN_TOUCH, textAlign: 'right', borderWidth: 1, borderColor: fault ? colors.danger : colors.inputBorder, borderRadius: radius.sm, paddingHorizontal: space.xs, backgroundColor: tint, color: colors.ink }]}
                      />
                    ) : (
                      <View style={{ minHeight: MIN_TOUCH, justifyContent: 'center', alignItems: 'flex-end', paddingHorizontal: space.xs, backgroundColor: tint, borderRadius: radius.sm }}>
                        <Text style={[figure, { color: j < i && onChange ? colors.mutedInk : colors.ink }]}>{Number.isFinite(v) ? decimal(v, 2) : '?'}</Text>
                      </View>
                    )}
                  </View>
                );
              })}
            </View>
          ))}
        </View>
      </ScrollView>
      {n > 0 && problems.length > 0 ? (
        <View role="alert" style={{ gap: 2 }}>
          {problems.map((p, k) => (
            <Text key={k} style={[type.caption, { color: colors.danger }]}>
              {p.path.length === 2 ? `${names[p.path[0]]} × ${names[p.path[1]]}: ` : ''}
              {p.message}
            </Text>
          ))}
        </View>
      ) : onChange ? (
        <Text style={[type.caption, { color: colors.mutedInk }]}>Edit above the diagonal; the entry below mirrors it. The matrix is checked as you type.</Text>
      ) : null}
    </View>
  );
}
