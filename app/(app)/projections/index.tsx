import { useMemo, useState } from 'react';
import { Pressable, Text, View } from 'react-native';
import { useRouter } from 'expo-router';
import { Button, Card, Field, Loading, Notice, Screen, styles } from '@/components/ui';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';
import { fieldError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useRunChoices, useRuns, useStartRun, type RunSummary } from '@/hooks/useRuns';
import { count, dateTime, lambda as lambdaText, percent } from '@/figures';

const PATH_CHOICES = [1000, 2000, 5000, 10000];
const newSeed = () => Math.floor(Math.random() * 2_147_483_647);

export default function Projections() {
  const { scheme, can } = useCurrentScheme();
  const runs = useRuns(scheme?.id);
  if (!scheme) return <Loading />;
  return (
    <Screen title="Projections" subtitle="Compare candidate default options for the scheme's illustrative members.">
      {can('runs:create') ? <NewComparison schemeId={scheme.id} /> : null}
      <Card title="Earlier runs">
        {runs.isLoading ? <Loading /> : null}
        {runs.error ? <Notice tone="error">{runs.error.message}</Notice> : null}
        {runs.data?.runs.length === 0 ? <Text style={styles.muted}>No runs yet.</Text> : null}
        {runs.data?.runs.map((r) => <RunRow key={r.id} run={r} />)}
      </Card>
    </Screen>
  );
}

function RunRow({ run }: { run: RunSummary }) {
  const router = useRouter();
  const when = dateTime(run.createdAt);
  return (
    <Pressable
      accessibilityRole="link"
      onPress={() => router.push(`/projections/${run.id}`)}
      style={{ paddingVertical: space.sm, borderTopWidth: 1, borderColor: colors.rule, minHeight: MIN_TOUCH, gap: 2 }}
    >
      <Text style={[type.label, { color: colors.primary }]}>
        {run.options.length} options × {run.members.length} members · {count(run.paths)} paths{run.stress ? ' · with stress' : ''}
        {run.rerunOf ? ' · repeat run' : ''}
      </Text>
      <Text style={styles.muted}>
        {when} · seed {run.seed} · λ {lambdaText(run.riskAversion)} · assumptions v{run.assumptionSet.version}
        {run.assumptionsDraft ? ' (DRAFT)' : ''} · {run.status === 'running' ? `running ${percent(run.progress, 'chance')}` : run.status}
      </Text>
    </Pressable>
  );
}

function Chip({ label, selected, onPress, note }: { label: string; selected: boolean; onPress: () => void; note?: string }) {
  return (
    <Pressable
      accessibilityRole="checkbox"
      accessibilityState={{ checked: selected }}
      accessibilityLabel={note ? `${label} (${note})` : label}
      onPress={onPress}
      style={{
        minHeight: MIN_TOUCH,
        paddingHorizontal: space.md,
        justifyContent: 'center',
        borderRadius: radius.md,
        borderWidth: 1,
        borderColor: selected ? colors.primary : colors.inputBorder,
        backgroundColor: selected ? colors.primaryTint : colors.surface,
      }}
    >
      <Text style={[type.label, { color: selected ? colors.primary : colors.ink }]}>
        {selected ? '✓ ' : ''}
        {label}
        {note ? <Text style={{ color: colors.danger }}> {note}</Text> : null}
      </Text>
    </Pressable>
  );
}

function NewComparison({ schemeId }: { schemeId: string }) {
  const router = useRouter();
  const choices = useRunChoices(schemeId);
  const start = useStartRun(schemeId);
  // null = the default: the newest approved set, every option, every member.
  const [chosenSetId, setSetId] = useState<string | null>(null);
  const [chosenOptionIds, setOptionIds] = useState<string[] | null>(null);
  const [chosenMemberIds, setMemberIds] = useState<string[] | null>(null);
  const [paths, setPaths] = useState(2000);
  const [seed, setSeed] = useState(() => String(newSeed()));
  const [lambda, setLambda] = useState('2');
  const [targetPct, setTargetPct] = useState('50');
  const [stressOn, setStressOn] = useState(false);
  const [stressFund, setStressFund] = useState<string | null>(null);
  const [stressYears, setStressYears] = useState('1');
  const [stressFallPct, setStressFallPct] = useState('30');
  const [formError, setFormError] = useState<string | null>(null);

  const data = choices.data;
  const setId = chosenSetId ?? (data?.assumptionSets.find((s) => s.status === 'approved') ?? data?.assumptionSets[0])?.id ?? null;
  const optionIds = chosenOptionIds ?? data?.options.map((o) => o.id) ?? null;
  const memberIds = chosenMemberIds ?? data?.members.map((m) => m.id) ?? null;
  const set = data?.assumptionSets.find((s) => s.id === setId);
  const setFunds = useMemo(() => (set ? set.fundOrder.map((id) => data!.funds.find((f) => f.id === id)).filter((f): f is { id: string; name: string } => !!f) : []), [set, data]);

  if (choices.isLoading) return <Loading />;
  if (choices.error) return <Notice tone="error">{choices.error.message}</Notice>;
  if (!data) return null;
  const toggle = (list: string[] | null, id: string) => (list ?? []).includes(id) ? (list ?? []).filter((x) => x !== id) : [...(list ?? []), id];
  const err = (p: string) => fieldError(start.error, p);

  const submit = () => {
    setFormError(null);
    const num = (s: string) => (s.trim() === '' ? Number.NaN : Number(s));
    if (!setId) return setFormError('Choose an assumption set.');
    start.mutate(
      {
        assumptionSetId: setId,
        optionIds: optionIds ?? [],
        memberIds: memberIds ?? [],
        paths,
        seed: num(seed),
        riskAversion: num(lambda),
        targetReplacementRatio: num(targetPct) / 100,
        stress: stressOn ? { fundId: stressFund ?? setFunds[0]?.id ?? '', yearsBeforeRetirement: num(stressYears), fall: num(stressFallPct) / 100 } : undefined,
      },
      { onSuccess: (run) => router.push(`/projections/${run.id}`) },
    );
  };

  return (
    <Card title="New comparison">
      <Text style={styles.label}>Assumption set</Text>
      <View style={styles.row}>
        {data.assumptionSets.map((s) => (
          <Chip key={s.id} label={`Version ${s.version} · ${s.setAt}`} note={s.status === 'draft' ? 'DRAFT' : undefined} selected={s.id === setId} onPress={() => setSetId(s.id)} />
        ))}
      </View>
      {set?.status === 'draft' ? <Notice tone="warning">These assumptions are a draft: every result of this run will be marked as based on draft assumptions.</Notice> : null}
      {err('assumptionSetId') ? <Text style={styles.error}>Assumption set: {err('assumptionSetId')}</Text> : null}

      <Text style={styles.label}>Default options to compare</Text>
      <View style={styles.row}>
        {data.options.map((o) => (
          <Chip key={o.id} label={o.name} selected={(optionIds ?? []).includes(o.id)} onPress={() => setOptionIds(toggle(optionIds, o.id))} />
        ))}
      </View>
      {err('optionIds') ? <Text style={styles.error}>Options: {err('optionIds')}</Text> : null}

      <Text style={styles.label}>Illustrative members</Text>
      <View style={styles.row}>
        {data.members.map((m) => (
          <Chip key={m.id} label={`${m.label} (${m.age}→${m.retirementAge})`} selected={(memberIds ?? []).includes(m.id)} onPress={() => setMemberIds(toggle(memberIds, m.id))} />
        ))}
      </View>
      {err('memberIds') ? <Text style={styles.error}>Members: {err('memberIds')}</Text> : null}

      <Text style={styles.label}>Number of paths</Text>
      <View style={styles.row}>
        {PATH_CHOICES.map((p) => (
          <Chip key={p} label={count(p)} selected={paths === p} onPress={() => setPaths(p)} />
        ))}
      </View>

      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md, marginTop: space.sm }}>
        <View style={{ minWidth: 160, flexGrow: 1 }}>
          <Field label="Seed" value={seed} onChangeText={setSeed} inputMode="numeric" error={err('seed')} hint="Random by default; the same seed gives the same results." />
          <Button kind="secondary" label="New random seed" onPress={() => setSeed(String(newSeed()))} />
        </View>
        <View style={{ minWidth: 160, flexGrow: 1 }}>
          <Field label="Board's risk aversion λ" value={lambda} onChangeText={setLambda} inputMode="decimal" error={err('riskAversion')} hint="Can be changed on the results without running again." />
        </View>
        <View style={{ minWidth: 160, flexGrow: 1 }}>
          <Field label="Income target (% of final salary)" value={targetPct} onChangeText={setTargetPct} inputMode="decimal" error={err('targetReplacementRatio')} />
        </View>
      </View>

      <Chip label="Add a stress: a fall in one fund before retirement" selected={stressOn} onPress={() => setStressOn(!stressOn)} />
      {stressOn ? (
        <View style={{ gap: space.sm }}>
          <Text style={styles.label}>Fund that falls</Text>
          <View style={styles.row}>
            {setFunds.map((f) => (
              <Chip key={f.id} label={f.name} selected={(stressFund ?? setFunds[0]?.id) === f.id} onPress={() => setStressFund(f.id)} />
            ))}
          </View>
          <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
            <View style={{ minWidth: 160, flexGrow: 1 }}>
              <Field label="Fall (%)" value={stressFallPct} onChangeText={setStressFallPct} inputMode="decimal" error={err('stress.fall')} />
            </View>
            <View style={{ minWidth: 160, flexGrow: 1 }}>
              <Field label="Years before retirement" value={stressYears} onChangeText={setStressYears} inputMode="numeric" error={err('stress.yearsBeforeRetirement')} hint="1 = the final year before retirement." />
            </View>
          </View>
        </View>
      ) : null}

      {formError ? <Notice tone="error">{formError}</Notice> : null}
      {start.error && !start.error.message.startsWith('Some fields') ? <Notice tone="error">{start.error.message}</Notice> : null}
      <Button label="Start comparison" onPress={submit} busy={start.isPending} />
    </Card>
  );
}
