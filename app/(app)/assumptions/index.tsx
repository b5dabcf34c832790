import { useState } from 'react';
import { Pressable, Text, View } from 'react-native';
import { useRouter } from 'expo-router';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { DataTable } from '@/components/DataTable';
import { StatusBadge } from '@/components/StatusBadge';
import { date } from '@/figures';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useAssumptionSets, useNewDraft } from '@/hooks/useAssumptions';

export default function AssumptionsScreen() {
  const router = useRouter();
  const { can } = useCurrentScheme();
  const { data: sets, isLoading, error } = useAssumptionSets();
  const newDraft = useNewDraft();
  const [pair, setPair] = useState<string[]>([]);
  const latest = sets?.[0];
  const latestApproved = sets?.find((s) => s.status === 'approved');

  const toggle = (id: string) => setPair((p) => (p.includes(id) ? p.filter((x) => x !== id) : [...p.slice(-1), id]));

  return (
    <Screen
      title="Assumptions"
      subtitle="Capital-market assumptions, one version at a time. The actuary drafts; a trustee approves; an approved version never changes."
      actions={
        can('assumptions:edit') ? (
          <>
            <Button label="From price history" kind="secondary" onPress={() => router.push('/assumptions/history')} testID="open-history" />
            {latest ? <Button label={`New draft from v${latest.version}`} onPress={() => newDraft.mutate(latest.id, { onSuccess: (d) => router.push(`/assumptions/${d.id}`) })} busy={newDraft.isPending} /> : null}
          </>
        ) : null
      }
    >
      {isLoading ? <Loading /> : null}
      {error ? <Notice tone="error">{error.message}</Notice> : null}
      {newDraft.error ? <Notice tone="error">{newDraft.error.message}</Notice> : null}
      {sets ? (
        <Card title="Versions">
          {latestApproved ? (
            <Text style={styles.body}>
              In force: version {latestApproved.version}, set at {date(latestApproved.setAt)}, approved by {latestApproved.approvedBy ?? 'a former trustee'} on {date(latestApproved.approvedAt)}.
            </Text>
          ) : (
            <Notice tone="warning">No version has been approved yet; projections will be marked as draft.</Notice>
          )}
          <DataTable
            label="Assumption set versions"
            testID="versions"
            rows={sets}
            rowKey={(s) => s.id}
            onRowPress={(s) => router.push(`/assumptions/${s.id}`)}
            columns={[
              { key: 'v', title: 'Version', width: 90, render: (s) => `v${s.version}` },
              { key: 'status', title: 'Status', width: 110, render: (s) => <StatusBadge status={s.status} /> },
              { key: 'setAt', title: 'Set at', width: 120, render: (s) => date(s.setAt) },
              { key: 'by', title: 'Drafted by', width: 170, render: (s) => s.createdBy ?? '—' },
              { key: 'approvedBy', title: 'Approved by', width: 160, render: (s) => s.approvedBy ?? '—' },
              { key: 'approvedAt', title: 'Approved on', width: 130, render: (s) => date(s.approvedAt) },
            ]}
          />
        </Card>
      ) : null}
      {sets && sets.length > 1 ? (
        <Card title="Compare two versions">
          <Text style={styles.muted}>Pick two versions to see every figure side by side.</Text>
          <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.sm }}>
            {sets.map((s) => {
              const on = pair.includes(s.id);
              return (
                <Pressable
                  key={s.id}
                  accessibilityRole="checkbox"
                  accessibilityState={{ checked: on }}
                  onPress={() => toggle(s.id)}
                  style={{ minHeight: MIN_TOUCH, minWidth: 64, paddingHorizontal: space.md, borderRadius: radius.md, borderWidth: 1, borderColor: on ? colors.primary : colors.rule, backgroundColor: on ? colors.primaryTint : colors.surface, alignItems: 'center', justifyContent: 'center' }}
                >
                  <Text style={[type.label, { color: on ? colors.primary : colors.ink }]}>v{s.version}</Text>
                </Pressable>
              );
            })}
          </View>
          <View style={styles.row}>
            <Button
              label="Compare"
              disabled={pair.length !== 2}
              onPress={() => {
                const [a, b] = [...pair].sort((x, y) => sets.findIndex((s) => s.id === y) - sets.findIndex((s) => s.id === x));
                router.push(`/assumptions/compare?a=${a}&b=${b}`);
              }}
            />
          </View>
        </Card>
      ) : null}
    </Screen>
  );
}
