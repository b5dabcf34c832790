import { useMemo, useState } from 'react';
import { Pressable, Text, View, useWindowDimensions } from 'react-native';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { CautionNotice } from '@/components/CautionNotice';
import { ComparisonTable, pinFirst } from '@/components/ComparisonTable';
import { FanChart } from '@/components/FanChart';
import { LambdaControl } from '@/components/LambdaControl';
import { ProgressBar } from '@/components/ProgressBar';
import { breakEvenSentence, money, rankOptions } from '@/components/projectionFigures';
import { colors, MIN_TOUCH, radius, space, type, WIDE_BREAKPOINT } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useRerun, useRun, type RunDetail, type StoredVariant } from '@/hooks/useRuns';

export default function RunView() {
  const { runId } = useLocalSearchParams<{ runId: string }>();
  const { scheme, can } = useCurrentScheme();
  const run = useRun(scheme?.id, runId);
  const rerun = useRerun(scheme?.id);
  const router = useRouter();
  if (!scheme || run.isLoading) return <Loading />;
  if (run.error || !run.data) return <Notice tone="error">{run.error?.message ?? 'No such run.'}</Notice>;
  const r = run.data;
  const subtitle = `Assumptions version ${r.assumptionSet.version}${r.assumptionsDraft ? ' (DRAFT)' : ''} · ${r.paths.toLocaleString('en-GB')} paths · seed ${r.seed}${r.engineVersion ? ` · engine ${r.engineVersion}` : ''}`;
  return (
    <Screen
      title="Comparison of default options"
      subtitle={subtitle}
      actions={
        r.status === 'done' && can('runs:create') ? (
          <Button kind="secondary" label="Run again to check" busy={rerun.isPending} onPress={() => rerun.mutate(r.id, { onSuccess: (n) => router.push(`/projections/${n.id}`) })} />
        ) : undefined
      }
    >
      <CautionNotice draft={r.assumptionsDraft} />
      {r.status === 'queued' || r.status === 'running' ? (
        <Card title={r.stalled ? 'Stalled' : r.status === 'queued' ? 'Waiting for a worker' : 'Simulating'}>
          {r.stalled ? (
            <Notice tone="warning">The worker running this projection stopped responding. It goes back to the queue within a minute and starts again from the beginning; nothing needs doing.</Notice>
          ) : (
            <ProgressBar fraction={r.progress} label={r.status === 'queued' ? 'Queued' : 'Progress'} />
          )}
        </Card>
      ) : null}
      {r.status === 'failed' ? <Notice tone="error">{`This run failed: ${r.error ?? 'no reason was recorded'}`}</Notice> : null}
      {rerun.error ? <Notice tone="error">{rerun.error.message}</Notice> : null}
      {r.status === 'done' && r.result ? <Results run={r} currency={scheme.currency} /> : null}
    </Screen>
  );
}

function Results({ run, currency }: { run: RunDetail; currency: string }) {
  const result = run.result!;
  const { can } = useCurrentScheme();
  const router = useRouter();
  const [lambda, setLambda] = useState(run.riskAversion);
  const [memberId, setMemberId] = useState(run.members[0].id);
  const [nominal, setNominal] = useState(false);
  const [width, setWidth] = useState(0);
  const { width: windowWidth } = useWindowDimensions();
  const names = useMemo(() => Object.fromEntries(run.options.map((o) => [o.id, o.name])), [run.options]);
  const colorOf = (id: string) => colors.series[run.options.findIndex((o) => o.id === id) % colors.series.length];
  const scenario = run.input.scenario;
  const ranked = useMemo(() => rankOptions(result.base, scenario, names, memberId, lambda), [result.base, scenario, names, memberId, lambda]);
  const sentence = useMemo(() => breakEvenSentence(result.base, ranked, memberId), [result.base, ranked, memberId]);
  const stressedRanked = useMemo(() => (result.stressed ? rankOptions(result.stressed, scenario, names, memberId, lambda) : null), [result.stressed, scenario, names, memberId, lambda]);
  const columns = windowWidth >= WIDE_BREAKPOINT && width > 700 ? 2 : 1;
  const chartWidth = Math.floor((width - (columns - 1) * space.lg) / columns) - 2 * space.lg - 2;
  const member = run.input.members.find((m) => m.id === memberId);
  const pairs = result.base.result.results.filter((p) => p.memberId === memberId);
  const deflate = (p: (typeof pairs)[number]) => (nominal ? p.bands.nominal : p.bands.real);
  const yMax = Math.max(...pairs.map((p) => Math.max(...deflate(p).p95, nominal ? 0 : p.atRetirement.targetRealPot))) * 1.05;
  const stress = run.stress;
  const stressFund = stress ? run.input.funds.find((f) => f.id === stress.fundId)?.name : null;

  return (
    <View style={{ gap: space.lg }} onLayout={(e) => setWidth(e.nativeEvent.layout.width)}>
      {result.reproduction ? (
        <Notice tone={result.reproduction.matches ? 'success' : 'error'}>
          {result.reproduction.matches
            ? 'Run again from the stored inputs and seed: the results match the original run exactly.'
            : `Run again from the stored inputs and seed: the results differ from the original, first at ${result.reproduction.firstDifference?.path} (original ${JSON.stringify(result.reproduction.firstDifference?.original)}, now ${JSON.stringify(result.reproduction.firstDifference?.rerun)}).`}
        </Notice>
      ) : null}

      <Card title="Illustrative member">
        <View style={styles.row}>
          {run.members.map((m) => (
            <Toggle key={m.id} label={m.label} selected={m.id === memberId} onPress={() => setMemberId(m.id)} />
          ))}
        </View>
        {member ? (
          <Text style={styles.muted}>
            Age {member.age}, retiring at {member.retirementAge}. Income target: {Math.round(run.targetReplacementRatio * 100)}% of final salary, bought at retirement.
          </Text>
        ) : null}
      </Card>

      <Card title="Board's risk aversion">
        <LambdaControl value={lambda} onChange={setLambda} currency={currency} />
      </Card>

      <Card title={`Options ranked at λ = ${lambda}`}>
        {sentence ? (
          <Text style={[type.body, { color: colors.ink, fontFamily: type.label.fontFamily }]} testID="break-even-sentence">
            {sentence}
          </Text>
        ) : null}
        <ComparisonTable rows={ranked} currency={currency} lambda={lambda} colorOf={colorOf} baselineId={run.baselineOptionId} />
        <BaselineNote run={run} />
        {can('reports:create') ? (
          <View style={styles.row}>
            <Button kind="secondary" label={`Make a board report at λ = ${lambda}`} onPress={() => router.push(`/reports?run=${run.id}&lambda=${lambda}`)} />
          </View>
        ) : null}
        <Text style={styles.muted}>
          Pots at retirement in today&apos;s money, net of charges. ± is one Monte Carlo standard error. The certainty-equivalent pot is the sure amount the board would value as highly as the spread of outcomes at this λ
          {result.sample.kind === 'quantiles' ? `; away from the run's λ (${run.riskAversion}) it is computed from ${result.sample.size.toLocaleString('en-GB')} stored quantiles of the ${run.paths.toLocaleString('en-GB')} outcomes` : ''}.
        </Text>
      </Card>

      {stressedRanked && stress ? (
        <Card title={`With a ${Math.round(stress.fall * 100)}% fall in ${stressFund} ${stress.yearsBeforeRetirement} year${stress.yearsBeforeRetirement === 1 ? '' : 's'} before retirement`}>
          <Text style={styles.muted}>The same paths with the shock added. Median pot without and with the shock:</Text>
          {stressedRanked.map((s) => {
            const base = ranked.find((b) => b.optionId === s.optionId)!;
            return (
              <Text key={s.optionId} style={styles.body}>
                {s.name}: {money(base.pair.atRetirement.percentiles.real.p50, currency)} → {money(s.pair.atRetirement.percentiles.real.p50, currency)}
              </Text>
            );
          })}
          <ComparisonTable rows={stressedRanked} currency={currency} lambda={lambda} colorOf={colorOf} baselineId={run.baselineOptionId} />
        </Card>
      ) : null}

      <View style={[styles.row, { justifyContent: 'space-between' }]}>
        <Text style={[type.title, { color: colors.ink }]}>Pot by age</Text>
        <View style={styles.row}>
          <Toggle label="Today's money" selected={!nominal} onPress={() => setNominal(false)} />
          <Toggle label="Money of the day" selected={nominal} onPress={() => setNominal(true)} />
        </View>
      </View>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.lg }}>
        {width > 0
          ? pinFirst(ranked, run.baselineOptionId).map((row) => (
              <Card key={row.optionId} style={{ width: columns === 1 ? '100%' : chartWidth + 2 * space.lg + 2 }}>
                <FanChart
                  title={`${row.name} — ${member?.label ?? ''}`}
                  ages={row.pair.ages}
                  bands={deflate(row.pair)}
                  target={nominal ? null : row.pair.atRetirement.targetRealPot}
                  currency={currency}
                  realTerms={!nominal}
                  width={columns === 1 ? width - 2 * space.lg - 2 : chartWidth}
                  yMax={yMax}
                  accent={colorOf(row.optionId)}
                />
              </Card>
            ))
          : null}
      </View>
      <VariantNote variant={result.base} />
    </View>
  );
}

/** Which option was the baseline, and the versions the run used (runs made before versions name none). */
function BaselineNote({ run }: { run: RunDetail }) {
  const baseline = run.options.find((o) => o.id === run.baselineOptionId);
  const versions = run.options.filter((o) => o.version !== null);
  const drafts = run.options.filter((o) => o.status === 'draft');
  return (
    <View style={{ gap: 2 }}>
      <Text style={styles.muted} testID="baseline-note">
        {baseline
          ? `${baseline.name} was the scheme's current default when this run was made: it is shown first, as the baseline, with its rank.`
          : run.baselineOptionId
            ? "The scheme's current default when this run was made is not among its options."
            : 'No option was marked as the current default when this run was made.'}
      </Text>
      {versions.length ? <Text style={styles.muted}>Versions run: {versions.map((o) => `${o.name} v${o.version}${o.status === 'draft' ? ' (DRAFT)' : ''}`).join(', ')}.</Text> : <Text style={styles.muted}>Made before options were versioned: the options as they stood then are kept in the run.</Text>}
      {drafts.length ? <Notice tone="warning">{`${drafts.map((o) => o.name).join(', ')} ran as ${drafts.length === 1 ? 'a draft version' : 'draft versions'} not yet approved.`}</Notice> : null}
    </View>
  );
}

function VariantNote({ variant }: { variant: StoredVariant }) {
  return (
    <Text style={styles.muted}>
      Inflation {(variant.result.inflation * 100).toFixed(1)}% a year; {variant.result.paths.toLocaleString('en-GB')} simulated paths; seed {variant.result.seed}.
    </Text>
  );
}

function Toggle({ label, selected, onPress }: { label: string; selected: boolean; onPress: () => void }) {
  return (
    <Pressable
      accessibilityRole="button"
      accessibilityState={{ selected }}
      onPress={onPress}
      style={{
        minHeight: MIN_TOUCH,
        paddingHorizontal: space.md,
        justifyContent: 'center',
        borderRadius: radius.md,
        borderWidth: 1,
        borderColor: colors.primary,
        backgroundColor: selected ? colors.primary : colors.surface,
      }}
    >
      <Text style={[type.label, { color: selected ? colors.onPrimary : colors.primary }]}>{label}</Text>
    </Pressable>
  );
}
