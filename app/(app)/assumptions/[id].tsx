import { useMemo, useState } from 'react';
import { Pressable, Text, View, useWindowDimensions } from 'react-native';
import { Controller, useFieldArray, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { Link, useLocalSearchParams, useRouter } from 'expo-router';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { DataTable } from '@/components/DataTable';
import { CorrelationEditor } from '@/components/CorrelationEditor';
import { NumberField, PercentField, showServerIssues, TextField } from '@/components/FormFields';
import { StatusBadge } from '@/components/StatusBadge';
import { ApprovalPanel } from '@/components/ApprovalPanel';
import { date, percent } from '@/figures';
import { AssumptionSetBody, type AssumptionSetInput } from '@/schemas/assumptions';
import { colors, MIN_TOUCH, space, type, WIDE_BREAKPOINT } from '@/constants/theme';
import { ApiError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useFunds } from '@/hooks/useFunds';
import { useSession } from '@/hooks/useSession';
import { contentOf, useApproveSet, useAssumptionSet, useDiscardDraft, useNewDraft, useSaveDraft, type AssumptionContent, type AssumptionSet } from '@/hooks/useAssumptions';

function Summary({ set }: { set: AssumptionSet }) {
  const figures: [string, string][] = [
    ['Inflation', percent(set.inflation, 'rate')],
    ['Salary growth', percent(set.salaryGrowth, 'rate')],
    ['Income conversion', `${percent(set.annuityRealRate, 'rate')} real over ${set.annuityYears} years`],
  ];
  return (
    <>
      <Card title="Economy and income">
        {figures.map(([k, v]) => (
          <View key={k} style={{ flexDirection: 'row', justifyContent: 'space-between', gap: space.md, paddingVertical: 4, borderBottomWidth: 1, borderColor: colors.rule }}>
            <Text style={styles.body}>{k}</Text>
            <Text style={[styles.body, { fontVariant: ['tabular-nums'] }]}>{v}</Text>
          </View>
        ))}
        {set.rationale ? (
          <View style={{ marginTop: space.sm }}>
            <Text style={styles.label}>Rationale</Text>
            <Text style={styles.body}>{set.rationale}</Text>
          </View>
        ) : null}
      </Card>
      <Card title="Funds">
        <DataTable
          label="Fund assumptions"
          rows={set.funds}
          rowKey={(f) => f.fundId}
          columns={[
            { key: 'name', title: 'Fund', width: 160, render: (f) => f.name },
            { key: 'r', title: 'Expected return', align: 'right', width: 120, render: (f) => percent(f.expectedReturn, 'rate') },
            { key: 'v', title: 'Volatility', align: 'right', width: 100, render: (f) => percent(f.volatility, 'rate') },
            { key: 'c', title: 'Annual charge', align: 'right', width: 110, render: (f) => percent(f.annualCharge, 'rate') },
          ]}
        />
        <Text style={styles.muted}>Expected return and volatility of the annual simple nominal return; the charge is a fraction of the pot a year.</Text>
      </Card>
      <Card title="Correlations">
        <CorrelationEditor names={set.funds.map((f) => f.name)} matrix={set.correlations} />
      </Card>
    </>
  );
}

export default function AssumptionSetScreen() {
  const { id } = useLocalSearchParams<{ id: string }>();
  const router = useRouter();
  const { can } = useCurrentScheme();
  const { data: set, isLoading, error } = useAssumptionSet(id);
  const { data: me } = useSession();
  const approve = useApproveSet();
  const newDraft = useNewDraft();
  const [confirmApprove, setConfirmApprove] = useState(false);

  if (isLoading) return <Loading />;
  if (error || !set) return <Screen title="Assumptions"><Notice tone="error">{error?.message ?? 'Not found'}</Notice></Screen>;
  const editing = set.status === 'draft' && can('assumptions:edit');

  return (
    <Screen
      title={`Assumptions v${set.version}`}
      subtitle={`Set at ${date(set.setAt)} · drafted by ${set.createdBy ?? '—'}${set.basedOnVersion ? ` from v${set.basedOnVersion}` : ''}`}
      actions={<StatusBadge status={set.status} />}
    >
      {set.status === 'approved' ? (
        <Notice tone="success">{`Approved by ${set.approvedBy ?? 'a former trustee'} on ${date(set.approvedAt)}. This version can no longer change; a change starts a new draft copied from it.`}</Notice>
      ) : (
        <Notice tone="warning">Draft: not yet approved. Results that use it are marked as draft.</Notice>
      )}
      <View style={styles.row}>
        {set.basedOnId ? (
          <Link href={`/assumptions/compare?a=${set.basedOnId}&b=${set.id}`} style={[type.label, { color: colors.primary, paddingVertical: space.sm }]}>
            Compare with v{set.basedOnVersion}
          </Link>
        ) : null}
        {set.status === 'approved' && can('assumptions:edit') ? (
          <Button label="Start a new draft from this version" onPress={() => newDraft.mutate(set.id, { onSuccess: (n) => router.push(`/assumptions/${n.id}`) })} busy={newDraft.isPending} />
        ) : null}
      </View>
      {set.status === 'draft' || set.approvals.length > 1 ? (
        <Card title="Approval">
          <ApprovalPanel
            what={`assumption set v${set.version}`}
            status={set.status}
            approvals={set.approvals}
            required={set.approvalsRequired}
            lastEditor={set.updatedBy}
            youLastEdited={!!me && set.updatedById === me.user.id}
            youApproved={!!me && set.approvals.some((a) => a.userId === me.user.id)}
            canApprove={can('assumptions:approve') && !confirmApprove}
            onApprove={() => setConfirmApprove(true)}
          />
        </Card>
      ) : null}
      {confirmApprove ? (
        <Card title={`Approve version ${set.version}?`}>
          <Text style={styles.body}>
            {set.approvals.length + 1 >= set.approvalsRequired
              ? "Once approved, these assumptions cannot be changed. Projections will use them as the scheme's approved basis."
              : `Your approval is ${set.approvals.length + 1} of the ${set.approvalsRequired} the scheme needs; the set stays a draft until another trustee approves it too.`}
          </Text>
          {approve.error ? <Notice tone="error">{approve.error.message}</Notice> : null}
          <View style={styles.row}>
            <Button label="Approve" onPress={() => approve.mutate(set.id, { onSuccess: () => setConfirmApprove(false) })} busy={approve.isPending} testID="confirm-approve" />
            <Button label="Cancel" kind="secondary" onPress={() => setConfirmApprove(false)} />
          </View>
        </Card>
      ) : null}
      {editing ? <DraftEditor key={set.id} set={set} /> : <Summary set={set} />}
    </Screen>
  );
}

const RATE_FIELDS = [
  ['inflation', 'Inflation', 'Price inflation a year.'],
  ['salaryGrowth', 'Salary growth', 'Nominal, a year; an illustrative member may override it.'],
  ['annuityRealRate', 'Income conversion: real rate', 'Real interest rate that turns a pot into a level real income.'],
] as const;
const FUND_FIELDS = [
  ['expectedReturn', 'Return'],
  ['volatility', 'Volatility'],
  ['annualCharge', 'Charge'],
] as const;

/**
 * A draft's content as a form: react-hook-form checked by the API's own schema
 * (schemas/assumptions.ts), rates typed as percentages and stored as exact fractions.
 */
function DraftEditor({ set }: { set: AssumptionSet }) {
  const router = useRouter();
  const { width } = useWindowDimensions();
  const { data: schemeFunds } = useFunds();
  const save = useSaveDraft();
  const discard = useDiscardDraft();
  const [saved, setSaved] = useState(false);
  const [elsewhere, setElsewhere] = useState<{ path: string; message: string }[]>([]);
  const form = useForm<AssumptionSetInput, unknown, AssumptionContent>({ resolver: zodResolver(AssumptionSetBody), defaultValues: contentOf(set), mode: 'onTouched' });
  const { control, handleSubmit, reset, setError, setValue, getValues, formState } = form;
  const funds = useFieldArray({ control, name: 'funds', keyName: 'key' });
  const names = useMemo(() => new Map([...(schemeFunds?.funds ?? []).map((f) => [f.id, f.name] as const), ...set.funds.map((f) => [f.fundId, f.name] as const)]), [schemeFunds, set.funds]);
  const inSet = new Set(funds.fields.map((f) => f.fundId));
  const addable = (schemeFunds?.funds ?? []).filter((f) => !inSet.has(f.id));
  const correlations = () => getValues('correlations') ?? [];

  const addFund = (fundId: string) => {
    const n = funds.fields.length;
    const m = correlations().map((r) => [...r, 0]);
    m.push([...new Array<number>(n).fill(0), 1]);
    funds.append({ fundId, expectedReturn: Number.NaN, volatility: Number.NaN, annualCharge: Number.NaN });
    setValue('correlations', m, { shouldDirty: true });
  };
  const removeFund = (k: number) => {
    funds.remove(k);
    setValue('correlations', correlations().filter((_, i) => i !== k).map((r) => r.filter((_, j) => j !== k)), { shouldDirty: true });
  };
  const submit = handleSubmit((content) => {
    setSaved(false);
    setElsewhere([]);
    save.mutate(
      { id: set.id, content },
      {
        onSuccess: (s) => (reset(contentOf(s)), setSaved(true)),
        onError: (e) => setElsewhere(showServerIssues(e, setError, (path) => !path.startsWith('correlations') && (path in getValues() || /^funds\.\d+\./.test(path)))),
      },
    );
  });
  const fundError = (i: number) => formState.errors.funds?.[i]?.fundId?.message;
  const matrixIssues = save.error instanceof ApiError ? save.error.issues.filter((i) => i.path.startsWith('correlations')) : [];

  return (
    <>
      {save.error && !(save.error instanceof ApiError && save.error.status === 400) ? <Notice tone="error">{save.error.message}</Notice> : null}
      {save.error instanceof ApiError && save.error.status === 400 && elsewhere.length ? (
        <Notice tone="error">{`${save.error.message} ${elsewhere.map((i) => `${i.path}: ${i.message}`).join('; ')}`.trim()}</Notice>
      ) : null}
      {formState.errors.funds?.root?.message || formState.errors.funds?.message ? <Notice tone="error">{`Funds: ${formState.errors.funds?.root?.message ?? formState.errors.funds?.message}`}</Notice> : null}
      {saved && !formState.isDirty ? <Notice tone="success">Draft saved.</Notice> : null}
      <View style={{ flexDirection: width >= WIDE_BREAKPOINT ? 'row' : 'column', gap: space.lg, alignItems: 'flex-start' }}>
        <Card title="Economy and income" style={{ flex: 1, alignSelf: 'stretch' }}>
          <TextField control={control} name="setAt" label="Set at (YYYY-MM-DD)" />
          {RATE_FIELDS.map(([key, label, hint]) => (
            <PercentField key={key} control={control} name={key} label={`${label} (%)`} hint={hint} />
          ))}
          <NumberField control={control} name="annuityYears" label="Income conversion: years of income" integer />
          <TextField control={control} name="rationale" label="Rationale" multiline style={{ minHeight: 96, paddingTop: space.sm }} />
        </Card>
        <Card title="Funds (% a year)" style={{ flex: 1, alignSelf: 'stretch' }}>
          <View style={{ flexDirection: 'row', gap: space.sm, justifyContent: 'flex-end' }}>
            {FUND_FIELDS.map(([k, label]) => (
              <Text key={k} style={[type.caption, { width: 96, textAlign: 'right', color: colors.mutedInk }]}>
                {label}
              </Text>
            ))}
            <View style={{ width: 32 }} />
          </View>
          {funds.fields.map((f, i) => {
            const name = names.get(f.fundId) ?? f.fundId;
            return (
              <View key={f.key} testID={`fund-row-${i}`} style={{ gap: space.xs, paddingVertical: space.xs, borderBottomWidth: 1, borderColor: colors.rule }}>
                <Text style={styles.label}>{name}</Text>
                <View style={{ flexDirection: 'row', gap: space.sm, justifyContent: 'flex-end', alignItems: 'flex-start' }}>
                  {FUND_FIELDS.map(([k, label]) => (
                    <PercentField key={k} compact control={control} name={`funds.${i}.${k}`} label={`${name}: ${label} (%)`} />
                  ))}
                  <Pressable accessibilityRole="button" accessibilityLabel={`Take ${name} out of this set`} onPress={() => removeFund(i)} disabled={funds.fields.length <= 1} style={{ width: 32, minHeight: MIN_TOUCH, alignItems: 'center', justifyContent: 'center' }}>
                    <Text style={[type.title, { color: funds.fields.length <= 1 ? colors.rule : colors.danger }]}>×</Text>
                  </Pressable>
                </View>
                {fundError(i) ? <Text style={[type.caption, { color: colors.danger }]}>{fundError(i)}</Text> : null}
              </View>
            );
          })}
          {addable.length ? (
            <View style={{ gap: space.xs }}>
              <Text style={styles.muted}>Add a scheme fund to this set:</Text>
              <View style={styles.row}>
                {addable.map((f) => (
                  <Button key={f.id} label={`+ ${f.name}`} kind="secondary" onPress={() => addFund(f.id)} />
                ))}
              </View>
            </View>
          ) : null}
        </Card>
      </View>
      <Card title="Correlations">
        <Controller
          control={control}
          name="correlations"
          render={({ field }) => <CorrelationEditor names={funds.fields.map((f) => names.get(f.fundId) ?? f.fundId)} matrix={field.value ?? []} onChange={field.onChange} testID="correlations" />}
        />
        {matrixIssues.map((i, k) => (
          <Text key={k} role="alert" style={[type.caption, { color: colors.danger }]}>
            {i.path}: {i.message}
          </Text>
        ))}
      </Card>
      <View style={styles.row}>
        <Button label="Save draft" onPress={submit} busy={save.isPending} testID="save-draft" />
        <Button label="Discard changes" kind="secondary" onPress={() => (reset(contentOf(set)), save.reset(), setSaved(false), setElsewhere([]))} />
        <Button label="Delete this draft" kind="danger" onPress={() => discard.mutate(set.id, { onSuccess: () => router.replace('/assumptions') })} busy={discard.isPending} />
      </View>
      {discard.error ? <Notice tone="error">{discard.error.message}</Notice> : null}
    </>
  );
}
