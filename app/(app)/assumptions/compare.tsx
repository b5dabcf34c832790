import { Text } from 'react-native';
import { useLocalSearchParams } from 'expo-router';
import { Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { DataTable } from '@/components/DataTable';
import { StatusBadge } from '@/components/StatusBadge';
import { date, decimal, percent } from '@/figures';
import { useCompareSets, type FundAssumption } from '@/hooks/useAssumptions';

const FIELD_LABELS: Record<string, string> = {
  setAt: 'Set at',
  inflation: 'Inflation',
  salaryGrowth: 'Salary growth',
  annuityRealRate: 'Income conversion: real rate',
  annuityYears: 'Income conversion: years',
  rationale: 'Rationale',
};

function showField(field: string, v: string | number) {
  if (field === 'setAt') return date(String(v));
  if (field === 'annuityYears' || field === 'rationale') return String(v || '—');
  return percent(Number(v), 'rate');
}

const fundCell = (f: FundAssumption | null, k: keyof Omit<FundAssumption, 'fundId'>) => (f ? percent(f[k], 'rate') : 'not in set');

export default function CompareScreen() {
  const { a, b } = useLocalSearchParams<{ a: string; b: string }>();
  const { data, isLoading, error } = useCompareSets(a, b);
  if (isLoading) return <Loading />;
  if (error || !data) return <Screen title="Compare versions"><Notice tone="error">{error?.message ?? 'Choose two different versions to compare.'}</Notice></Screen>;
  const A = `v${data.a.version}`;
  const B = `v${data.b.version}`;
  const changedFunds = data.funds.filter((f) => f.changed.length).length;
  const changedFields = data.fields.filter((f) => f.changed).length;
  return (
    <Screen title={`${A} and ${B} side by side`} subtitle={`${changedFields} economic figure${changedFields === 1 ? '' : 's'}, ${changedFunds} fund${changedFunds === 1 ? '' : 's'} and ${data.correlations.length} correlation${data.correlations.length === 1 ? '' : 's'} differ. Differences are tinted.`}>
      <Card title="Versions">
        <DataTable
          label="Versions compared"
          rows={[data.a, data.b]}
          rowKey={(s) => s.id}
          columns={[
            { key: 'v', title: 'Version', width: 90, render: (s) => `v${s.version}` },
            { key: 's', title: 'Status', width: 110, render: (s) => <StatusBadge status={s.status} /> },
            { key: 'by', title: 'Approved by', width: 150, render: (s) => s.approvedBy ?? '—' },
            { key: 'on', title: 'Approved on', width: 130, render: (s) => date(s.approvedAt) },
          ]}
        />
      </Card>
      <Card title="Economy and income">
        <DataTable
          label="Economic figures compared"
          rows={data.fields}
          rowKey={(f) => f.field}
          rowTone={(f) => (f.changed ? 'highlight' : undefined)}
          columns={[
            { key: 'f', title: 'Figure', width: 150, render: (f) => FIELD_LABELS[f.field] ?? f.field },
            { key: 'a', title: A, align: 'right', width: 140, render: (f) => showField(f.field, f.a) },
            { key: 'b', title: B, align: 'right', width: 140, render: (f) => showField(f.field, f.b) },
          ]}
        />
      </Card>
      <Card title="Funds">
        <DataTable
          label="Fund assumptions compared"
          testID="compare-funds"
          rows={data.funds}
          rowKey={(f) => f.fundId}
          rowTone={(f) => (f.changed.length ? 'highlight' : undefined)}
          columns={[
            { key: 'n', title: 'Fund', width: 150, render: (f) => f.name },
            { key: 'ra', title: `Return ${A}`, align: 'right', width: 100, render: (f) => fundCell(f.a, 'expectedReturn') },
            { key: 'rb', title: `Return ${B}`, align: 'right', width: 100, render: (f) => fundCell(f.b, 'expectedReturn') },
            { key: 'va', title: `Volatility ${A}`, align: 'right', width: 110, render: (f) => fundCell(f.a, 'volatility') },
            { key: 'vb', title: `Volatility ${B}`, align: 'right', width: 110, render: (f) => fundCell(f.b, 'volatility') },
            { key: 'ca', title: `Charge ${A}`, align: 'right', width: 100, render: (f) => fundCell(f.a, 'annualCharge') },
            { key: 'cb', title: `Charge ${B}`, align: 'right', width: 100, render: (f) => fundCell(f.b, 'annualCharge') },
          ]}
        />
      </Card>
      <Card title="Correlations that differ">
        {data.correlations.length === 0 ? (
          <Text style={styles.body}>The correlations are the same.</Text>
        ) : (
          <DataTable
            label="Correlations compared"
            rows={data.correlations}
            rowKey={(c) => `${c.fundA}-${c.fundB}`}
            columns={[
              { key: 'p', title: 'Pair', width: 200, render: (c) => `${c.nameA} × ${c.nameB}` },
              { key: 'a', title: A, align: 'right', width: 90, render: (c) => decimal(c.a, 2) },
              { key: 'b', title: B, align: 'right', width: 90, render: (c) => decimal(c.b, 2) },
            ]}
          />
        )}
      </Card>
    </Screen>
  );
}
