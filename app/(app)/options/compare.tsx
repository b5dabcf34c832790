import { Text, View, useWindowDimensions } from 'react-native';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { DataTable } from '@/components/DataTable';
import { GlidePathChart } from '@/components/GlidePathChart';
import { StatusBadge } from '@/components/StatusBadge';
import { date, dateTime, percent } from '@/figures';
import { space, WIDE_BREAKPOINT } from '@/constants/theme';
import { useFunds } from '@/hooks/useFunds';
import { useCompareVersions, type OptionVersion } from '@/hooks/useOptions';
import { weightsAt } from '@/simulation';

/** Two versions of a default option side by side: both glide paths and every weight that differs. */
export default function CompareVersions() {
  const { option, a, b } = useLocalSearchParams<{ option: string; a: string; b: string }>();
  const router = useRouter();
  const { width } = useWindowDimensions();
  const { data: funds } = useFunds();
  const cmp = useCompareVersions(option, a, b);
  if (cmp.isLoading || !funds) return <Loading />;
  if (cmp.error || !cmp.data) return <Screen title="Compare versions"><Notice tone="error">{cmp.error?.message ?? 'Choose two versions to compare.'}</Notice></Screen>;
  const { a: va, b: vb, changed, years } = cmp.data;
  const wide = width >= WIDE_BREAKPOINT;
  const ids = funds.funds.map((f) => f.id);
  const at = (v: OptionVersion, y: number) => weightsAt(v.glidePath, ids, y);
  const used = funds.funds.map((f, i) => ({ ...f, i })).filter((f) => years.some((y) => at(va, y)[f.i] > 0 || at(vb, y)[f.i] > 0));
  const what = [changed.name ? 'name' : '', changed.description ? 'description' : '', changed.glidePath ? 'glide path' : ''].filter(Boolean);
  const title = (v: OptionVersion) => `${v.name} v${v.version}`;

  return (
    <Screen title="Compare two versions" subtitle={`${title(va)} and ${title(vb)}`} actions={<Button kind="secondary" label="Back to the option" onPress={() => router.push(`/options/${option}`)} />}>
      <Notice tone={what.length ? 'info' : 'success'}>{what.length ? `Changed between them: ${what.join(', ')}.` : 'The two versions are the same.'}</Notice>
      <View style={{ flexDirection: wide ? 'row' : 'column', gap: space.lg }}>
        {[va, vb].map((v) => (
          <Card key={v.id} title={title(v)} style={{ flex: 1 }}>
            <StatusBadge status={v.status} />
            <Text style={styles.muted}>
              {v.status === 'approved' ? `Approved ${v.approvals.length ? `by ${v.approvals.map((x) => x.name).join(' and ')} ` : ''}on ${date(v.approvedAt)}` : `Draft, last changed by ${v.updatedBy ?? '—'} on ${dateTime(v.updatedAt)}`}
            </Text>
            {v.description ? <Text style={styles.body}>{v.description}</Text> : null}
            <GlidePathChart funds={funds.funds} glidePath={v.glidePath} title={`${title(v)}: fund mix by years to retirement`} />
          </Card>
        ))}
      </View>
      <Card title="Weights at each point">
        <Text style={styles.muted}>At every number of years to retirement either version names, each fund’s weight in both (between points the mix moves in a straight line).</Text>
        <DataTable
          label="Fund weights of the two versions"
          testID="version-weights"
          rows={years}
          rowKey={(y) => String(y)}
          rowTone={(y) => (used.some((f) => Math.abs(at(va, y)[f.i] - at(vb, y)[f.i]) > 1e-9) ? 'highlight' : undefined)}
          columns={[
            { key: 'y', title: 'Years to retirement', width: 110, align: 'right', render: (y) => String(y) },
            ...used.map((f) => ({ key: f.id, title: `${f.name} (v${va.version} → v${vb.version})`, width: 170, align: 'right' as const, render: (y: number) => `${percent(at(va, y)[f.i], 'share')} → ${percent(at(vb, y)[f.i], 'share')}` })),
          ]}
        />
      </Card>
    </Screen>
  );
}
