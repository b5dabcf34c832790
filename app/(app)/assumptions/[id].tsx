import { useMemo, useState } from 'react';
import { Pressable, Text, TextInput, View, useWindowDimensions } from 'react-native';
import { Link, useLocalSearchParams, useRouter } from 'expo-router';
import { Button, Card, Field, Loading, Notice, Screen, styles } from '@/components/ui';
import { DataTable } from '@/components/DataTable';
import { CorrelationEditor } from '@/components/CorrelationEditor';
import { StatusBadge } from '@/components/StatusBadge';
import { date, parseNumberInput, parsePercentInput, percent, percentInputText } from '@/figures';
import { colors, MIN_TOUCH, radius, space, type, WIDE_BREAKPOINT } from '@/constants/theme';
import { ApiError, fieldError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useFunds } from '@/hooks/useFunds';
import { useApproveSet, useAssumptionSet, useDiscardDraft, useNewDraft, useSaveDraft, type AssumptionContent, type AssumptionSet } from '@/hooks/useAssumptions';

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

type Draft = { text: Record<string, string>; fundIds: string[]; names: Record<string, string>; correlations: number[][] };

function toDraft(set: AssumptionSet): Draft {
  const text: Record<string, string> = {
    setAt: set.setAt,
    rationale: set.rationale,
    inflation: percentInputText(set.inflation),
    salaryGrowth: percentInputText(set.salaryGrowth),
    annuityRealRate: percentInputText(set.annuityRealRate),
    annuityYears: String(set.annuityYears),
  };
  for (const f of set.funds) for (const [k] of FUND_FIELDS) text[`${f.fundId}.${k}`] = percentInputText(f[k]);
  return { text, fundIds: set.funds.map((f) => f.fundId), names: Object.fromEntries(set.funds.map((f) => [f.fundId, f.name])), correlations: set.correlations.map((r) => r.slice()) };
}

/** The draft's text as API content, or the fields that are not numbers. */
function fromDraft(d: Draft): { content?: AssumptionContent; errors: Record<string, string> } {
  const errors: Record<string, string> = {};
  const rate = (key: string, path: string) => {
    const v = parsePercentInput(d.text[key] ?? '');
    if (v === null) errors[path] = 'enter a percentage, e.g. 2.5';
    return v ?? 0;
  };
  const years = parseNumberInput(d.text.annuityYears ?? '');
  if (years === null) errors.annuityYears = 'enter a whole number of years';
  const content: AssumptionContent = {
    setAt: (d.text.setAt ?? '').trim(),
    rationale: d.text.rationale ?? '',
    inflation: rate('inflation', 'inflation'),
    salaryGrowth: rate('salaryGrowth', 'salaryGrowth'),
    annuityRealRate: rate('annuityRealRate', 'annuityRealRate'),
    annuityYears: years ?? 0,
    funds: d.fundIds.map((fundId, i) => ({
      fundId,
      expectedReturn: rate(`${fundId}.expectedReturn`, `funds.${i}.expectedReturn`),
      volatility: rate(`${fundId}.volatility`, `funds.${i}.volatility`),
      annualCharge: rate(`${fundId}.annualCharge`, `funds.${i}.annualCharge`),
    })),
    correlations: d.correlations,
  };
  return Object.keys(errors).length ? { errors } : { content, errors };
}

function PctInput({ label, value, onChange, error }: { label: string; value: string; onChange: (s: string) => void; error?: string }) {
  return (
    <View style={{ width: 96 }}>
      <TextInput
        accessibilityLabel={label}
        value={value}
        onChangeText={onChange}
        inputMode="decimal"
        style={[type.body, { minHeight: MIN_TOUCH, textAlign: 'right', borderWidth: 1, borderColor: error ? colors.danger : colors.inputBorder, borderRadius: radius.sm, paddingHorizontal: space.sm, color: colors.ink, backgroundColor: colors.surface }]}
      />
      {error ? <Text style={[type.caption, { color: colors.danger }]}>{error}</Text> : null}
    </View>
  );
}

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
  const { width } = useWindowDimensions();
  const { data: set, isLoading, error } = useAssumptionSet(id);
  const { data: schemeFunds } = useFunds();
  const save = useSaveDraft();
  const approve = useApproveSet();
  const discard = useDiscardDraft();
  const newDraft = useNewDraft();
  const [draft, setDraft] = useState<Draft | null>(null);
  const [localErrors, setLocalErrors] = useState<Record<string, string>>({});
  const [saved, setSaved] = useState(false);
  const [confirmApprove, setConfirmApprove] = useState(false);

  const editing = !!set && set.status === 'draft' && can('assumptions:edit');
  const d = useMemo(() => draft ?? (set && editing ? toDraft(set) : null), [draft, set, editing]);
  const err = (path: string) => localErrors[path] ?? fieldError(save.error, path);
  const setText = (key: string, v: string) => {
    setSaved(false);
    setDraft({ ...d!, text: { ...d!.text, [key]: v } });
  };

  if (isLoading) return <Loading />;
  if (error || !set) return <Screen title="Assumptions"><Notice tone="error">{error?.message ?? 'Not found'}</Notice></Screen>;

  const addable = (schemeFunds?.funds ?? []).filter((f) => d && !d.fundIds.includes(f.id));
  const addFund = (fid: string, name: string) => {
    const n = d!.fundIds.length;
    const m = d!.correlations.map((r) => [...r, 0]);
    m.push([...new Array<number>(n).fill(0), 1]);
    setDraft({ ...d!, fundIds: [...d!.fundIds, fid], names: { ...d!.names, [fid]: name }, correlations: m, text: { ...d!.text, [`${fid}.expectedReturn`]: '', [`${fid}.volatility`]: '', [`${fid}.annualCharge`]: '' } });
  };
  const removeFund = (k: number) => {
    setDraft({ ...d!, fundIds: d!.fundIds.filter((_, i) => i !== k), correlations: d!.correlations.filter((_, i) => i !== k).map((r) => r.filter((_, j) => j !== k)) });
  };
  const submit = () => {
    const { content, errors } = fromDraft(d!);
    setLocalErrors(errors);
    if (!content) return;
    save.mutate({ id: set.id, content }, { onSuccess: (s) => (setDraft(toDraft(s)), setSaved(true)) });
  };
  const serverOnly = save.error instanceof ApiError ? save.error.issues.filter((i) => !i.path.startsWith('funds') && !i.path.startsWith('correlations') && !(i.path in (d?.text ?? {}))) : [];

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
        {set.status === 'draft' && can('assumptions:approve') && !confirmApprove ? <Button label={`Approve v${set.version}`} onPress={() => setConfirmApprove(true)} testID="approve" /> : null}
      </View>
      {confirmApprove ? (
        <Card title={`Approve version ${set.version}?`}>
          <Text style={styles.body}>Once approved, these assumptions cannot be changed. Projections will use them as the scheme&apos;s approved basis.</Text>
          {approve.error ? <Notice tone="error">{approve.error.message}</Notice> : null}
          <View style={styles.row}>
            <Button label="Approve" onPress={() => approve.mutate(set.id, { onSuccess: () => setConfirmApprove(false) })} busy={approve.isPending} testID="confirm-approve" />
            <Button label="Cancel" kind="secondary" onPress={() => setConfirmApprove(false)} />
          </View>
        </Card>
      ) : null}

      {!editing || !d ? (
        <Summary set={set} />
      ) : (
        <>
          {save.error && !(save.error instanceof ApiError && save.error.status === 400) ? <Notice tone="error">{save.error.message}</Notice> : null}
          {save.error instanceof ApiError && save.error.status === 400 ? (
            <Notice tone="error">
              {`${save.error.message} ${serverOnly.map((i) => `${i.path}: ${i.message}`).join('; ')}`.trim()}
            </Notice>
          ) : null}
          {saved ? <Notice tone="success">Draft saved.</Notice> : null}
          <View style={{ flexDirection: width >= WIDE_BREAKPOINT ? 'row' : 'column', gap: space.lg, alignItems: 'flex-start' }}>
            <Card title="Economy and income" style={{ flex: 1, alignSelf: 'stretch' }}>
              <Field label="Set at (YYYY-MM-DD)" value={d.text.setAt} onChangeText={(v) => setText('setAt', v)} error={err('setAt')} />
              {RATE_FIELDS.map(([key, label, hint]) => (
                <Field key={key} label={`${label} (%)`} value={d.text[key]} onChangeText={(v) => setText(key, v)} error={err(key)} hint={hint} inputMode="decimal" />
              ))}
              <Field label="Income conversion: years of income" value={d.text.annuityYears} onChangeText={(v) => setText('annuityYears', v)} error={err('annuityYears')} inputMode="numeric" />
              <Field label="Rationale" value={d.text.rationale} onChangeText={(v) => setText('rationale', v)} error={err('rationale')} multiline style={{ minHeight: 96, paddingTop: space.sm }} />
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
              {d.fundIds.map((fid, i) => (
                <View key={fid} testID={`fund-row-${i}`} style={{ gap: space.xs, paddingVertical: space.xs, borderBottomWidth: 1, borderColor: colors.rule }}>
                  <Text style={styles.label}>{d.names[fid] ?? fid}</Text>
                  <View style={{ flexDirection: 'row', gap: space.sm, justifyContent: 'flex-end', alignItems: 'flex-start' }}>
                    {FUND_FIELDS.map(([k, label]) => (
                      <PctInput key={k} label={`${d.names[fid]}: ${label} (%)`} value={d.text[`${fid}.${k}`] ?? ''} onChange={(v) => setText(`${fid}.${k}`, v)} error={err(`funds.${i}.${k}`)} />
                    ))}
                    <Pressable accessibilityRole="button" accessibilityLabel={`Take ${d.names[fid]} out of this set`} onPress={() => removeFund(i)} disabled={d.fundIds.length <= 1} style={{ width: 32, minHeight: MIN_TOUCH, alignItems: 'center', justifyContent: 'center' }}>
                      <Text style={[type.title, { color: d.fundIds.length <= 1 ? colors.rule : colors.danger }]}>×</Text>
                    </Pressable>
                  </View>
                  {err(`funds.${i}.fundId`) ? <Text style={[type.caption, { color: colors.danger }]}>{err(`funds.${i}.fundId`)}</Text> : null}
                </View>
              ))}
              {addable.length ? (
                <View style={{ gap: space.xs }}>
                  <Text style={styles.muted}>Add a scheme fund to this set:</Text>
                  <View style={styles.row}>
                    {addable.map((f) => (
                      <Button key={f.id} label={`+ ${f.name}`} kind="secondary" onPress={() => addFund(f.id, f.name)} />
                    ))}
                  </View>
                </View>
              ) : null}
            </Card>
          </View>
          <Card title="Correlations">
            <CorrelationEditor names={d.fundIds.map((f) => d.names[f] ?? f)} matrix={d.correlations} onChange={(m) => (setSaved(false), setDraft({ ...d, correlations: m }))} testID="correlations" />
            {save.error instanceof ApiError
              ? save.error.issues
                  .filter((i) => i.path.startsWith('correlations'))
                  .map((i, k) => (
                    <Text key={k} role="alert" style={[type.caption, { color: colors.danger }]}>
                      {i.path}: {i.message}
                    </Text>
                  ))
              : null}
          </Card>
          <View style={styles.row}>
            <Button label="Save draft" onPress={submit} busy={save.isPending} testID="save-draft" />
            <Button label="Discard changes" kind="secondary" onPress={() => (setDraft(null), setLocalErrors({}), save.reset(), setSaved(false))} />
            <Button label="Delete this draft" kind="danger" onPress={() => discard.mutate(set.id, { onSuccess: () => router.replace('/assumptions') })} busy={discard.isPending} />
          </View>
          {discard.error ? <Notice tone="error">{discard.error.message}</Notice> : null}
        </>
      )}
    </Screen>
  );
}
