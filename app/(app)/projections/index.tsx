import { useMemo, useState } from 'react';
import { Pressable, Text, View } from 'react-native';
import { useRouter } from 'expo-router';
import { Controller, useController, useForm, useWatch, type Control } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { Chip } from '@/components/Chip';
import { NumberField, PercentField, showServerIssues } from '@/components/FormFields';
import { BOARD_LAMBDA } from '@/constants/riskAversion';
import { RUN_PATHS, RunBody } from '@/schemas/runs';
import { colors, MIN_TOUCH, space, type } from '@/constants/theme';
import { ApiError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useRunChoices, useRuns, useStartRun, type RunChoices, type RunRequest, type RunSummary } from '@/hooks/useRuns';
import { count, date, dateTime, lambda as lambdaText, percent } from '@/figures';

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
        {run.assumptionsDraft ? ' (DRAFT)' : ''} · {run.stalled ? 'stalled — will be retried' : run.status === 'running' ? `running ${percent(run.progress, 'chance')}` : run.status}
      </Text>
    </Pressable>
  );
}

function NewComparison({ schemeId }: { schemeId: string }) {
  const choices = useRunChoices(schemeId);
  if (choices.isLoading) return <Loading />;
  if (choices.error) return <Notice tone="error">{choices.error.message}</Notice>;
  if (!choices.data) return null;
  return <RunForm schemeId={schemeId} choices={choices.data} />;
}

/** Start a run: react-hook-form checked by the API's own schema (schemas/runs.ts). */
function RunForm({ schemeId, choices: data }: { schemeId: string; choices: RunChoices }) {
  const router = useRouter();
  const start = useStartRun(schemeId);
  const defaults: RunRequest = {
    assumptionSetId: (data.assumptionSets.find((s) => s.status === 'approved') ?? data.assumptionSets[0])?.id ?? '',
    optionIds: data.options.map((o) => o.id),
    memberIds: data.members.map((m) => m.id),
    paths: RUN_PATHS.default,
    seed: newSeed(),
    riskAversion: BOARD_LAMBDA.default,
    targetReplacementRatio: 0.5,
    optionVersions: {},
    stress: undefined,
  };
  const { control, handleSubmit, setValue, setError } = useForm<RunRequest, unknown, z.output<typeof RunBody>>({ resolver: zodResolver(RunBody), defaultValues: defaults, mode: 'onTouched' });
  const setId = useWatch({ control, name: 'assumptionSetId' });
  const stress = useWatch({ control, name: 'stress' });
  const optionIds = useWatch({ control, name: 'optionIds' });
  // Options with a newer draft beside the approved version a run would use: the draft may be run instead.
  const withDraft = data.options.filter((o) => o.draft && o.version.status === 'approved' && (optionIds ?? []).includes(o.id));
  const set = data.assumptionSets.find((s) => s.id === setId);
  const setFunds = useMemo(() => (set ? set.fundOrder.map((id) => data.funds.find((f) => f.id === id)).filter((f): f is { id: string; name: string } => !!f) : []), [set, data]);
  const [elsewhere, setElsewhere] = useState<{ path: string; message: string }[]>([]);
  const submit = handleSubmit((body) => {
    setElsewhere([]);
    // A draft chosen for an option later left out is not sent.
    const optionVersions = Object.fromEntries(Object.entries(body.optionVersions ?? {}).filter(([id]) => body.optionIds.includes(id)));
    start.mutate({ ...body, optionVersions }, {
      onSuccess: (run) => router.push(`/projections/${run.id}`),
      onError: (e) => setElsewhere(showServerIssues(e, setError, (path) => /^(assumptionSetId|optionIds|memberIds|paths|seed|riskAversion|targetReplacementRatio|stress\.(fundId|fall|yearsBeforeRetirement))$/.test(path.replace(/\.\d+$/, '')))),
    });
  });

  return (
    <Card title="New comparison">
      <Text style={styles.label}>Assumption set</Text>
      <ChipField control={control} name="assumptionSetId" what="Assumption set" single choices={data.assumptionSets.map((x) => ({ id: x.id, label: `Version ${x.version} · ${date(x.setAt)}`, note: x.status === 'draft' ? 'DRAFT' : undefined }))} />
      {set?.status === 'draft' ? <Notice tone="warning">These assumptions are a draft: every result of this run will be marked as based on draft assumptions.</Notice> : null}

      <Text style={styles.label}>Default options to compare</Text>
      <ChipField
        control={control}
        name="optionIds"
        what="Options"
        choices={data.options.map((o) => ({ id: o.id, label: `${o.name} v${o.version.version}${o.isCurrentDefault ? ' · current default' : ''}`, note: o.version.status === 'draft' ? 'DRAFT' : undefined }))}
      />
      {withDraft.length ? (
        <View style={{ gap: space.xs }}>
          <Text style={styles.muted}>Some options have a newer draft awaiting approval. Runs use the approved version unless you choose the draft:</Text>
          <Controller
            control={control}
            name="optionVersions"
            render={({ field }) => (
              <View style={styles.row}>
                {withDraft.map((o) => {
                  const on = field.value?.[o.id] === o.draft!.id;
                  const { [o.id]: _dropped, ...others } = field.value ?? {};
                  return <Chip key={o.id} label={`Run draft v${o.draft!.version} of ${o.name}`} note="DRAFT" selected={on} onPress={() => field.onChange(on ? others : { ...others, [o.id]: o.draft!.id })} />;
                })}
              </View>
            )}
          />
        </View>
      ) : null}

      <Text style={styles.label}>Illustrative members</Text>
      <ChipField control={control} name="memberIds" what="Members" choices={data.members.map((m) => ({ id: m.id, label: `${m.label} (${m.age}→${m.retirementAge})` }))} />

      <Text style={styles.label}>Number of paths</Text>
      <Controller
        control={control}
        name="paths"
        render={({ field }) => (
          <View style={styles.row}>
            {RUN_PATHS.offered.map((p) => (
              <Chip key={p} label={count(p)} selected={field.value === p} onPress={() => field.onChange(p)} />
            ))}
          </View>
        )}
      />

      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md, marginTop: space.sm }}>
        <View style={{ minWidth: 160, flexGrow: 1 }}>
          <NumberField control={control} name="seed" label="Seed" integer hint="Random by default; the same seed gives the same results." />
          <Button kind="secondary" label="New random seed" onPress={() => setValue('seed', newSeed(), { shouldValidate: true })} />
        </View>
        <View style={{ minWidth: 160, flexGrow: 1 }}>
          <NumberField control={control} name="riskAversion" label="Board's risk aversion λ" hint="Can be changed on the results without running again." />
        </View>
        <View style={{ minWidth: 160, flexGrow: 1 }}>
          <PercentField control={control} name="targetReplacementRatio" label="Income target (% of final salary)" />
        </View>
      </View>

      <Chip
        label="Add a stress: a fall in one fund before retirement"
        selected={!!stress}
        onPress={() => setValue('stress', stress ? undefined : { fundId: setFunds[0]?.id ?? '', yearsBeforeRetirement: 1, fall: 0.3 }, { shouldValidate: false })}
      />
      {stress ? (
        <View style={{ gap: space.sm }}>
          <Text style={styles.label}>Fund that falls</Text>
          <ChipField control={control} name="stress.fundId" what="Fund" single choices={setFunds.map((f) => ({ id: f.id, label: f.name }))} />
          <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.md }}>
            <View style={{ minWidth: 160, flexGrow: 1 }}>
              <PercentField control={control} name="stress.fall" label="Fall (%)" />
            </View>
            <View style={{ minWidth: 160, flexGrow: 1 }}>
              <NumberField control={control} name="stress.yearsBeforeRetirement" label="Years before retirement" integer hint="1 = the final year before retirement." />
            </View>
          </View>
        </View>
      ) : null}

      {elsewhere.length ? <Notice tone="error">{elsewhere.map((i) => `${i.path}: ${i.message}`).join('; ')}</Notice> : null}
      {start.error && !(start.error instanceof ApiError && start.error.status === 400) ? <Notice tone="error">{start.error.message}</Notice> : null}
      <Button label="Start comparison" onPress={submit} busy={start.isPending} />
    </Card>
  );
}

/** Chips bound to a field of the run form: one choice (`single`) or several, with the field's message below. */
function ChipField({ control, name, what, choices, single }: { control: Control<RunRequest>; name: 'assumptionSetId' | 'optionIds' | 'memberIds' | 'stress.fundId'; what: string; choices: { id: string; label: string; note?: string }[]; single?: boolean }) {
  const { field, fieldState } = useController({ control, name });
  const chosen: string[] = single ? [field.value as string] : ((field.value as string[] | undefined) ?? []);
  const pick = (id: string) => field.onChange(single ? id : chosen.includes(id) ? chosen.filter((x) => x !== id) : [...chosen, id]);
  const message = fieldState.error?.message ?? fieldState.error?.root?.message;
  return (
    <>
      <View style={styles.row}>
        {choices.map((c) => (
          <Chip key={c.id} label={c.label} note={c.note} selected={chosen.includes(c.id)} onPress={() => pick(c.id)} />
        ))}
      </View>
      {message ? <Text style={styles.error}>{`${what}: ${message}`}</Text> : null}
    </>
  );
}
