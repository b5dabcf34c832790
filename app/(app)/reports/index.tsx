import { useState } from 'react';
import { Pressable, Text, View } from 'react-native';
import { Link, useLocalSearchParams, useRouter } from 'expo-router';
import { Button, Card, Field, Loading, Notice, Screen, styles } from '@/components/ui';
import { Choices } from '@/components/Choices';
import { CautionNotice } from '@/components/CautionNotice';
import { colors, space, type } from '@/constants/theme';
import { fieldError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useCreateReport, useFinishedRuns, useReports } from '@/hooks/useReports';
import { count, dateTime } from '@/figures';

const when = (d: string) => dateTime(d);

export default function Reports() {
  const { scheme, can } = useCurrentScheme();
  const list = useReports(scheme?.id);
  if (!scheme) return <Loading />;
  if (!can('reports:read')) {
    return (
      <Screen title="Board reports">
        <Notice>Board reports are for trustees, the actuary and board reviewers.</Notice>
      </Screen>
    );
  }
  return (
    <Screen title="Board reports" subtitle="Dated scenario reports made from finished projection runs, kept as issued.">
      {can('reports:create') ? <NewReport schemeId={scheme.id} /> : null}
      <Card title="Reports">
        {list.isLoading ? <Loading /> : null}
        {list.error ? <Notice tone="error">{list.error.message}</Notice> : null}
        {list.data && !list.data.reports.length ? <Text style={styles.muted}>No reports yet.</Text> : null}
        {list.data?.reports.map((r) => (
          <Link key={r.id} href={`/reports/${r.id}`} asChild>
            <Pressable accessibilityRole="link" style={{ paddingVertical: space.md, borderTopWidth: 1, borderColor: colors.rule, minHeight: 44 }}>
              <Text style={[type.label, { color: colors.primary, fontSize: 16 }]}>
                {r.title}
                {r.draft ? '  · DRAFT' : ''}
              </Text>
              <Text style={styles.muted}>
                {when(r.createdAt)} · λ = {r.riskAversion}
                {r.createdBy ? ` · by ${r.createdBy}` : ''}
              </Text>
            </Pressable>
          </Link>
        ))}
      </Card>
      <CautionNotice />
    </Screen>
  );
}

function NewReport({ schemeId }: { schemeId: string }) {
  const runs = useFinishedRuns(schemeId);
  const create = useCreateReport(schemeId);
  const router = useRouter();
  // A run's comparison screen links here with the run and the λ the board was looking at.
  const from = useLocalSearchParams<{ run?: string; lambda?: string }>();
  const [runId, setRunId] = useState<string | null>(from.run ?? null);
  const [title, setTitle] = useState('');
  const [lambda, setLambda] = useState(from.lambda ?? '');
  const chosen = runs.data?.find((r) => r.id === runId);
  const submit = () => {
    const riskAversion = lambda.trim() === '' ? undefined : Number(lambda);
    create.mutate({ runId: runId!, title: title.trim() || undefined, riskAversion }, { onSuccess: (r) => router.push(`/reports/${r.id}`) });
  };
  return (
    <Card title="Make a report">
      {runs.isLoading ? <Loading label="Loading finished runs…" /> : null}
      {runs.data && !runs.data.length ? <Notice>No finished projection runs yet. Run a projection first.</Notice> : null}
      {runs.data?.length ? (
        <Choices
          label="From run"
          value={runId}
          onChange={setRunId}
          options={runs.data.slice(0, 8).map((r) => ({
            value: r.id,
            label: `${r.finishedAt ? dateTime(r.finishedAt) : ''} · set v${r.assumptionSet.version}${r.assumptionsDraft ? ' DRAFT' : ''}`,
            hint: `${r.options.length} options × ${r.members.length} members · ${count(r.paths)} paths`,
          }))}
        />
      ) : null}
      <View style={{ height: space.sm }} />
      <Field label="Title" value={title} onChangeText={setTitle} placeholder="Default option review" error={fieldError(create.error, 'title')} />
      <Field
        label="Risk aversion λ for certainty equivalents"
        value={lambda}
        onChangeText={setLambda}
        inputMode="decimal"
        placeholder={chosen ? String(chosen.riskAversion) : 'the run’s own'}
        hint="Leave empty to use the run’s own λ."
        error={fieldError(create.error, 'riskAversion')}
      />
      {create.error && !fieldError(create.error, 'riskAversion') && !fieldError(create.error, 'title') ? <Notice tone="error">{create.error.message}</Notice> : null}
      <View style={styles.row}>
        <Button label="Make report" onPress={submit} busy={create.isPending} disabled={!runId} testID="make-report" />
      </View>
    </Card>
  );
}
