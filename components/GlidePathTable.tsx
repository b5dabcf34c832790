import { DataTable } from './DataTable';
import { percent } from '@/figures';

type Point = { yearsToRetirement: number; weights: Record<string, number> };

/** A glide path's points as a table: years to retirement, then each fund's weight. */
export function GlidePathTable({ funds, points, label = 'Glide path points' }: { funds: { id: string; name: string }[]; points: Point[]; label?: string }) {
  const sorted = [...points].sort((a, b) => b.yearsToRetirement - a.yearsToRetirement);
  const used = funds.filter((f) => sorted.some((p) => (p.weights[f.id] ?? 0) > 0));
  return (
    <DataTable
      label={label}
      rows={sorted}
      rowKey={(p) => String(p.yearsToRetirement)}
      columns={[
        { key: 'y', title: 'Years to retirement', width: 110, align: 'right', render: (p) => String(p.yearsToRetirement) },
        ...used.map((f) => ({ key: f.id, title: f.name, width: 120, align: 'right' as const, render: (p: Point) => percent(p.weights[f.id] ?? 0, 'share') })),
      ]}
    />
  );
}
