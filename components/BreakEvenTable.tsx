import { Text } from 'react-native';
import { BREAK_EVEN_COLUMNS, breakEvenNote, type BreakEvenRow } from '@/figures';
import { DataTable, type Column } from './DataTable';
import { styles } from './ui';

const WIDTHS = { member: 150, options: 230, text: 260 } as const;

/** Break-even λ as one small table (member × pair of options: none, or each crossing with its interval). Worded by figures/. */
export function BreakEvenTable({ rows, testID = 'break-even-table' }: { rows: Pick<BreakEvenRow, 'member' | 'options' | 'text'>[]; testID?: string }) {
  const columns: Column<(typeof rows)[number]>[] = BREAK_EVEN_COLUMNS.map((c) => ({ key: c.key, title: c.label, width: WIDTHS[c.key], render: (r) => r[c.key] }));
  return (
    <>
      <DataTable label="Break-even risk aversion by member and pair of options" columns={columns} rows={rows} rowKey={(r) => `${r.member}|${r.options}`} testID={testID} />
      <Text style={styles.muted}>{breakEvenNote()}</Text>
    </>
  );
}
