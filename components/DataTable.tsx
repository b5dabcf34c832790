import type { ReactNode } from 'react';
import { Pressable, ScrollView, Text, View, useWindowDimensions, type TextStyle } from 'react-native';
import { colors, space, type, WIDE_BREAKPOINT } from '@/constants/theme';

export type Column<T> = {
  key: string;
  title: string;
  /** Numbers right-aligned with tabular figures. */
  align?: 'left' | 'right';
  /** Width on phones (px); on wide screens columns share the width, at least this. */
  width?: number;
  render: (row: T) => ReactNode;
};

type Props<T> = {
  columns: Column<T>[];
  rows: T[];
  rowKey: (row: T) => string;
  onRowPress?: (row: T) => void;
  /** Describes the table for assistive technology. */
  label: string;
  /** Row tint, e.g. for a highlighted or changed row. */
  rowTone?: (row: T) => 'highlight' | 'muted' | undefined;
  empty?: string;
  testID?: string;
  /** Row height when cells hold more than two lines (default 48). */
  rowHeight?: number;
};

const ROW_HEIGHT = 48;
const figure: TextStyle = { ...type.figure, fontVariant: ['tabular-nums'] };

/**
 * A table that shows in full on wide screens and, on phones, scrolls sideways with its
 * first column pinned. Rows have a fixed height so the pinned column stays level.
 */
export function DataTable<T>({ columns, rows, rowKey, onRowPress, label, rowTone, empty = 'Nothing yet.', testID, rowHeight = ROW_HEIGHT }: Props<T>) {
  const { width } = useWindowDimensions();
  const wide = width >= WIDE_BREAKPOINT;
  const [first, ...rest] = columns;
  if (rows.length === 0) return <Text style={[type.body, { color: colors.mutedInk }]}>{empty}</Text>;

  const cell = (c: Column<T>, content: ReactNode, header: boolean, key: string, flex: boolean) => (
    <View
      key={key}
      role={header ? 'columnheader' : 'cell'}
      style={{
        width: flex ? undefined : (c.width ?? 110),
        flex: flex ? 1 : undefined,
        minWidth: flex ? (c.width ?? 90) : undefined,
        height: header ? ROW_HEIGHT : rowHeight,
        justifyContent: 'center',
        paddingHorizontal: space.sm,
        alignItems: c.align === 'right' ? 'flex-end' : 'flex-start',
      }}
    >
      {typeof content === 'string' || typeof content === 'number' ? (
        <Text numberOfLines={2} style={[header ? type.label : c.align === 'right' ? figure : type.body, { color: header ? colors.mutedInk : colors.ink, fontSize: header ? 13 : 15, lineHeight: header ? 18 : 20, textAlign: c.align === 'right' ? 'right' : 'left' }]}>
          {content}
        </Text>
      ) : (
        content
      )}
    </View>
  );

  const rowStyle = (r: T | null, i: number) => {
    const tone = r ? rowTone?.(r) : undefined;
    return {
      flexDirection: 'row' as const,
      borderBottomWidth: 1,
      borderColor: colors.rule,
      backgroundColor: tone === 'highlight' ? colors.accentTint : r === null ? colors.paper : i % 2 ? colors.stripe : colors.surface,
      opacity: tone === 'muted' ? 0.6 : 1,
    };
  };

  const rowWrap = (r: T, i: number, children: ReactNode) =>
    onRowPress ? (
      <Pressable key={rowKey(r)} role="row" accessibilityRole="link" onPress={() => onRowPress(r)} style={({ pressed }) => [rowStyle(r, i), pressed && { backgroundColor: colors.primaryTint }]}>
        {children}
      </Pressable>
    ) : (
      <View key={rowKey(r)} role="row" style={rowStyle(r, i)}>
        {children}
      </View>
    );

  if (wide) {
    return (
      <View role="table" aria-label={label} testID={testID} style={{ borderWidth: 1, borderColor: colors.rule, borderRadius: 8, overflow: 'hidden' }}>
        <View role="row" style={rowStyle(null, 0)}>
          {columns.map((c) => cell(c, c.title, true, c.key, true))}
        </View>
        {rows.map((r, i) => rowWrap(r, i, columns.map((c) => cell(c, c.render(r), false, c.key, true))))}
      </View>
    );
  }

  // Phone: the first column is pinned; the others scroll sideways beside it.
  return (
    <View aria-label={label} testID={testID} style={{ flexDirection: 'row', borderWidth: 1, borderColor: colors.rule, borderRadius: 8, overflow: 'hidden' }}>
      <View style={{ borderRightWidth: 1, borderColor: colors.rule, backgroundColor: colors.surface, zIndex: 1 }}>
        <View style={rowStyle(null, 0)}>{cell(first, first.title, true, first.key, false)}</View>
        {rows.map((r, i) => (
          <View key={rowKey(r)} style={rowStyle(r, i)}>
            {onRowPress ? (
              <Pressable accessibilityRole="link" onPress={() => onRowPress(r)}>
                {cell(first, first.render(r), false, first.key, false)}
              </Pressable>
            ) : (
              cell(first, first.render(r), false, first.key, false)
            )}
          </View>
        ))}
      </View>
      <ScrollView horizontal style={{ flex: 1 }} contentContainerStyle={{ flexGrow: 1 }}>
        <View style={{ flexGrow: 1 }}>
          <View style={rowStyle(null, 0)}>{rest.map((c) => cell(c, c.title, true, c.key, false))}</View>
          {rows.map((r, i) => (
            <View key={rowKey(r)} style={rowStyle(r, i)}>
              {rest.map((c) => cell(c, c.render(r), false, c.key, false))}
            </View>
          ))}
        </View>
      </ScrollView>
    </View>
  );
}
