import { useMemo, useState } from 'react';
import { Text, View, useWindowDimensions } from 'react-native';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { CautionNotice } from '@/components/CautionNotice';
import { ChanceChart } from '@/components/ChanceChart';
import { Chip } from '@/components/Chip';
import { ComparisonTable } from '@/components/ComparisonTable';
import { FanChart } from '@/components/FanChart';
import { LambdaControl } from '@/components/LambdaControl';
import { ProgressBar } from '@/components/ProgressBar';
import {
  baselineOf,
  baselineSentence,
  breakEvenRows,
  count,
  differenceRows,
  differencesToBaseline,
  exactErrors,
  lambda as lambdaText,
  leadSentence,
  money,
  onlyOwnLambdaText,
  percent,
  pinFirst,
  plural,
  rankAt,
  storedFigures,
  tooCloseLines,
  type ExactFigures,
} from '@/figures';
import { colors, optionStyle, space, type, WIDE_BREAKPOINT } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useRerun, useRun, useRunComparison, type RunDetail, type StoredVariant } from '@/hooks/useRuns';
import { ApiError } from '@/hooks/api';
import { BreakEvenTable } from '@/components/BreakEvenTable';
import { DifferenceTable } from '@/components/DifferenceTable';

export default function RunView() {
  const { runId } = useLocalSearchParams<{ runId: string }>();
  const { scheme, can } = useCurrentScheme();
  const run = useRun(scheme?.id, runId);
  const rerun = useRerun(scheme?.id);
  const router = useRouter();
  if (!scheme || run.isLoading) return <Loading />;
  if (run.error || !run.data) return <Notice tone="error">{run.error?.message ?? 'No such run.'}</Notice>;
  const r = run.data;
  const subtitle = `Assumptions version ${r.assumptionSet.version}${r.assumptionsDraft ? ' (DRAFT)' : ''} · ${count(r.paths)} paths · seed ${r.seed}${r.engineVersion ? ` · engine ${r.engineVersion}` : ''}`;
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
      {r.status === 'done' && r.result ? <Results run={r} schemeId={scheme.id} currency={scheme.currency} /> : null}
    </Screen>
  );
}

function Results({ run, schemeId, currency }: { run: RunDetail; schemeId: string; currency: string }) {
  const result = run.result!;
  const { can } = useCurrentScheme();
  const router = useRouter();
  const [lambda, setLambda] = useState(run.riskAversion);
  const [memberId, setMemberId] = useState(run.members[0].id);
  const [nominal, setNominal] = useState(false);
  const [width, setWidth] = useState(0);
  const { width: windowWidth } = useWindowDimensions();
  const names = useMemo(() => Object.fromEntries(run.options.map((o) => [o.id, o.name])), [run.options]);
  const memberLabels = useMemo(() => Object.fromEntries(run.members.map((m) => [m.id, m.label])), [run.members]);
  const styleOf = (id: string) => optionStyle(run.options.findIndex((o) => o.id === id));
  // Every figure at λ is exact, from every path's pot on the server; runs stored before pots were kept (409) show their own λ only.
  const exact = useRunComparison(schemeId, run.id, lambda, 'base');
  const ownLambdaOnly = exact.error instanceof ApiError && exact.error.status === 409;
  const stressedExact = useRunComparison(schemeId, run.id, lambda, 'stressed', !!result.stressed && !ownLambdaOnly);
  const ex: ExactFigures | undefined = ownLambdaOnly ? storedFigures(result.base) : exact.data;
  const stressedEx: ExactFigures | undefined = result.stressed ? (ownLambdaOnly ? storedFigures(result.stressed) : stressedExact.data) : undefined;
  const shownLambda = ex?.lambda ?? lambda;
  const ranked = useMemo(() => (ex ? rankAt(result.base, ex, memberId, names) : []), [result.base, ex, names, memberId]);
  // Differences are measured from the scheme's current default when the run was made (else the top-ranked option).
  const baseline = baselineOf(ranked, run.baselineOptionId);
  const differences = useMemo(() => (ex && baseline ? differenceRows(differencesToBaseline(ranked, baseline.optionId, exactErrors(ex, memberId)), currency) : []), [ranked, baseline, ex, memberId, currency]);
  const breakEven = useMemo(() => breakEvenRows(result.base.result.breakEven, names, memberLabels), [result.base, names, memberLabels]);
  const lead = ex ? leadSentence(ranked, currency, ex.paths) : null;
  const tooClose = tooCloseLines(ranked);
  const stressedRanked = useMemo(() => (result.stressed && stressedEx ? rankAt(result.stressed, stressedEx, memberId, names) : null), [result.stressed, stressedEx, names, memberId]);
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
            <Chip kind="toggle" key={m.id} label={m.label} selected={m.id === memberId} onPress={() => setMemberId(m.id)} />
          ))}
        </View>
        {member ? (
          <Text style={styles.muted}>
            Age {member.age}, retiring at {member.retirementAge}. Income target: {percent(run.targetReplacementRatio, 'rate')} of final salary, bought at retirement.
          </Text>
        ) : null}
      </Card>

      <Card title="Board's risk aversion">
        {ownLambdaOnly ? <Notice tone="warning">{onlyOwnLambdaText(run.riskAversion)}</Notice> : <LambdaControl value={lambda} onChange={setLambda} currency={currency} />}
        {exact.error && !ownLambdaOnly ? <Notice tone="error">{exact.error.message}</Notice> : null}
      </Card>

      <Card title={`Options ranked at λ = ${lambdaText(shownLambda)}`}>
        {!ex ? (
          <Loading label="Computing the figures at this λ from every path…" />
        ) : (
          <>
            {lead ? (
              <Text style={[type.body, { color: colors.ink, fontFamily: type.label.fontFamily }]} testID="lead-sentence">
                {lead}
              </Text>
            ) : null}
            <ComparisonTable rows={ranked} currency={currency} lambda={shownLambda} styleOf={styleOf} baselineId={run.baselineOptionId} />
            {tooClose.map((t) => (
              <Text key={t} style={styles.body} testID="too-close">
                {t}
              </Text>
            ))}
            <BaselineNote run={run} ranked={ranked} />
          </>
        )}
        {can('reports:create') ? (
          <View style={styles.row}>
            <Button kind="secondary" label={`Make a board report at λ = ${lambdaText(shownLambda)}`} onPress={() => router.push(`/reports?run=${run.id}&lambda=${shownLambda}`)} />
          </View>
        ) : null}
        <Text style={styles.muted}>
          Pots at retirement in today&apos;s money, net of charges. ± is one Monte Carlo standard error. The certainty-equivalent pot is the sure amount the board would value as highly as the spread of outcomes at this λ, computed from all {count(run.paths)} paths.
        </Text>
      </Card>

      {differences.length && baseline ? (
        <Card title={`Against the baseline, ${baseline.name}`}>
          <DifferenceTable rows={differences} baselineName={baseline.name} />
        </Card>
      ) : null}

      {breakEven.length ? (
        <Card title="Where the board's risk appetite changes the order">
          <BreakEvenTable rows={breakEven} />
        </Card>
      ) : null}

      <Card>
        <ChanceChart rows={ranked} width={Math.max(0, width - 2 * space.lg - 2)} styleOf={styleOf} />
      </Card>

      {stressedRanked && stress ? (
        <Card title={`With a ${percent(stress.fall, 'share')} fall in ${stressFund} ${plural(stress.yearsBeforeRetirement, 'year')} before retirement`}>
          <Text style={styles.muted}>The same paths with the shock added. Median pot without and with the shock:</Text>
          {stressedRanked.map((s) => {
            const base = ranked.find((b) => b.optionId === s.optionId)!;
            return (
              <Text key={s.optionId} style={styles.body}>
                {s.name}: {money(base.pair.atRetirement.percentiles.real.p50, currency)} → {money(s.pair.atRetirement.percentiles.real.p50, currency)}
              </Text>
            );
          })}
          <ComparisonTable rows={stressedRanked} currency={currency} lambda={shownLambda} styleOf={styleOf} baselineId={run.baselineOptionId} testID="stressed-comparison-table" />
        </Card>
      ) : null}

      <View style={[styles.row, { justifyContent: 'space-between' }]}>
        <Text style={[type.title, { color: colors.ink }]}>Pot by age</Text>
        <View style={styles.row}>
          <Chip kind="toggle" label="Today's money" selected={!nominal} onPress={() => setNominal(false)} />
          <Chip kind="toggle" label="Money of the day" selected={nominal} onPress={() => setNominal(true)} />
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
                  option={styleOf(row.optionId)}
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
function BaselineNote({ run, ranked }: { run: RunDetail; ranked: { optionId: string; name: string }[] }) {
  const versions = run.options.filter((o) => o.version !== null);
  const drafts = run.options.filter((o) => o.status === 'draft');
  return (
    <View style={{ gap: 2 }}>
      <Text style={styles.muted} testID="baseline-note">
        {baselineSentence(
          ranked.find((o) => o.optionId === run.baselineOptionId),
          run.baselineOptionId,
        )}
      </Text>
      {versions.length ? <Text style={styles.muted}>Versions run: {versions.map((o) => `${o.name} v${o.version}${o.status === 'draft' ? ' (DRAFT)' : ''}`).join(', ')}.</Text> : <Text style={styles.muted}>Made before options were versioned: the options as they stood then are kept in the run.</Text>}
      {drafts.length ? <Notice tone="warning">{`${drafts.map((o) => o.name).join(', ')} ran as ${drafts.length === 1 ? 'a draft version' : 'draft versions'} not yet approved.`}</Notice> : null}
    </View>
  );
}

function VariantNote({ variant }: { variant: StoredVariant }) {
  return (
    <Text style={styles.muted}>
      Inflation {percent(variant.result.inflation, 'rate')} a year; {count(variant.result.paths)} simulated paths; seed {variant.result.seed}.
    </Text>
  );
}
