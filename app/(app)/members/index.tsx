import { useState } from 'react';
import { Text, View, useWindowDimensions } from 'react-native';
import { Button, Card, Field, Loading, Notice, Screen, styles } from '@/components/ui';
import { DataTable } from '@/components/DataTable';
import { FileUpload, UploadProblems } from '@/components/FileUpload';
import { age, count, date, money, parseNumberInput, parsePercentInput, percent, percentInputText } from '@/figures';
import { space, WIDE_BREAKPOINT } from '@/constants/theme';
import { fieldError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useDeleteIllustrative, useIllustrativeMembers, useMembership, useSaveIllustrative, useUploadMembership, type IllustrativeInput, type IllustrativeMember } from '@/hooks/useMembers';

type FormText = Record<'label' | 'age' | 'retirementAge' | 'salary' | 'salaryGrowth' | 'contributionRate' | 'pot', string>;
const EMPTY: FormText = { label: '', age: '', retirementAge: '67', salary: '', salaryGrowth: '', contributionRate: '8', pot: '0' };

function toText(m: IllustrativeMember): FormText {
  return { label: m.label, age: String(m.age), retirementAge: String(m.retirementAge), salary: String(m.salary), salaryGrowth: m.salaryGrowth === null ? '' : percentInputText(m.salaryGrowth), contributionRate: percentInputText(m.contributionRate), pot: String(m.pot) };
}

function parse(t: FormText): { input?: IllustrativeInput; errors: Record<string, string> } {
  const errors: Record<string, string> = {};
  const num = (k: 'age' | 'retirementAge' | 'salary' | 'pot') => {
    const v = parseNumberInput(t[k]);
    if (v === null) errors[k] = 'enter a number';
    return v ?? 0;
  };
  const rate = parsePercentInput(t.contributionRate);
  if (rate === null) errors.contributionRate = 'enter a percentage, e.g. 8';
  const growth = t.salaryGrowth.trim() === '' ? null : parsePercentInput(t.salaryGrowth);
  if (t.salaryGrowth.trim() !== '' && growth === null) errors.salaryGrowth = 'enter a percentage, or leave empty to use the assumption set';
  const input = { label: t.label, age: num('age'), retirementAge: num('retirementAge'), salary: num('salary'), pot: num('pot'), contributionRate: rate ?? 0, salaryGrowth: growth };
  return Object.keys(errors).length ? { errors } : { input, errors };
}

function Illustrative({ currency }: { currency: string }) {
  const { can } = useCurrentScheme();
  const { width } = useWindowDimensions();
  const { data, isLoading, error } = useIllustrativeMembers();
  const save = useSaveIllustrative();
  const remove = useDeleteIllustrative();
  const [editing, setEditing] = useState<IllustrativeMember | null>(null);
  const [text, setText] = useState<FormText>(EMPTY);
  const [local, setLocal] = useState<Record<string, string>>({});
  const editable = can('members:edit');
  const err = (k: string) => local[k] ?? fieldError(save.error, k);
  const start = (m: IllustrativeMember | null) => {
    setEditing(m);
    setText(m ? toText(m) : EMPTY);
    setLocal({});
    save.reset();
  };
  const submit = () => {
    const { input, errors } = parse(text);
    setLocal(errors);
    if (input) save.mutate({ id: editing?.id, input }, { onSuccess: () => start(null) });
  };
  const f = (k: keyof FormText, label: string, hint?: string) => <Field key={k} label={label} value={text[k]} onChangeText={(v) => setText({ ...text, [k]: v })} error={err(k)} hint={hint} inputMode={k === 'label' ? undefined : 'decimal'} style={{ minWidth: 120 }} />;

  return (
    <>
      <Card title="Illustrative members">
        <Text style={styles.muted}>Typical members whose outcomes the projections show.</Text>
        {isLoading ? <Loading /> : null}
        {error ? <Notice tone="error">{error.message}</Notice> : null}
        {data ? (
          <DataTable
            label="Illustrative members"
            testID="illustrative"
            rows={data}
            rowKey={(m) => m.id}
            onRowPress={editable ? start : undefined}
            rowTone={(m) => (m.id === editing?.id ? 'highlight' : undefined)}
            columns={[
              { key: 'label', title: 'Member', width: 130, render: (m) => m.label },
              { key: 'age', title: 'Age', align: 'right', width: 60, render: (m) => String(m.age) },
              { key: 'ret', title: 'Retires at', align: 'right', width: 90, render: (m) => String(m.retirementAge) },
              { key: 'salary', title: 'Salary', align: 'right', width: 100, render: (m) => money(m.salary, currency, 'entered') },
              { key: 'growth', title: 'Salary growth', align: 'right', width: 110, render: (m) => (m.salaryGrowth === null ? 'as assumed' : percent(m.salaryGrowth, 'rate')) },
              { key: 'rate', title: 'Contribution', align: 'right', width: 110, render: (m) => percent(m.contributionRate, 'rate') },
              { key: 'pot', title: 'Pot today', align: 'right', width: 100, render: (m) => money(m.pot, currency, 'entered') },
            ]}
          />
        ) : null}
      </Card>
      {editable ? (
        <Card title={editing ? `Change ${editing.label}` : 'Add an illustrative member'}>
          {save.error && save.error instanceof Error && !Object.keys(EMPTY).some((k) => fieldError(save.error, k)) ? <Notice tone="error">{save.error.message}</Notice> : null}
          <View style={width >= WIDE_BREAKPOINT ? { flexDirection: 'row', flexWrap: 'wrap', columnGap: space.lg } : undefined}>
            {f('label', 'Label')}
            {f('age', 'Age')}
            {f('retirementAge', 'Retirement age')}
            {f('salary', `Salary (${currency})`)}
            {f('salaryGrowth', 'Salary growth (%)', 'Empty: use the assumption set')}
            {f('contributionRate', 'Contribution rate (% of salary)')}
            {f('pot', `Pot today (${currency})`)}
          </View>
          <View style={styles.row}>
            <Button label={editing ? 'Save changes' : 'Add member'} onPress={submit} busy={save.isPending} disabled={!text.label.trim()} />
            {editing ? <Button label="Cancel" kind="secondary" onPress={() => start(null)} /> : null}
            {editing ? <Button label="Remove" kind="danger" onPress={() => remove.mutate(editing.id, { onSuccess: () => start(null) })} busy={remove.isPending} /> : null}
          </View>
        </Card>
      ) : null}
    </>
  );
}

function Membership({ currency }: { currency: string }) {
  const { can } = useCurrentScheme();
  const [offset, setOffset] = useState(0);
  const limit = 25;
  const { data, isLoading, error } = useMembership(offset, limit);
  const upload = useUploadMembership();
  return (
    <Card title="Membership">
      <Text style={styles.muted}>Pseudonymous records of every member, for projections across the whole membership.</Text>
      {isLoading ? <Loading /> : null}
      {error ? <Notice tone="error">{error.message}</Notice> : null}
      {data ? (
        <>
          <Text style={styles.body} testID="membership-count">
            {count(data.count)} members{data.uploadedAt ? `, uploaded ${date(data.uploadedAt)}` : ''}. Median age {data.medians.age === null ? '—' : age(data.medians.age)}, median salary {money(data.medians.salary, currency, 'entered')}, median pot {money(data.medians.pot, currency)}, total pots {money(data.totals.pot, currency)}.
          </Text>
          <Text style={styles.muted}>By age: {data.ages.map((a) => `${a.band}: ${a.count}`).join(' · ')}</Text>
          <DataTable
            label="Membership records"
            rows={data.rows}
            rowKey={(r) => String(r.id)}
            empty="No membership has been uploaded."
            columns={[
              { key: 'ref', title: 'Reference', width: 110, render: (r) => r.reference },
              { key: 'age', title: 'Age', align: 'right', width: 60, render: (r) => String(r.age) },
              { key: 'salary', title: 'Salary', align: 'right', width: 100, render: (r) => money(r.salary, currency, 'entered') },
              { key: 'pot', title: 'Pot', align: 'right', width: 100, render: (r) => money(r.pot, currency, 'entered') },
              { key: 'rate', title: 'Contribution', align: 'right', width: 110, render: (r) => percent(r.contributionRate, 'rate') },
              { key: 'ret', title: 'Retires at', align: 'right', width: 90, render: (r) => String(r.retirementAge) },
            ]}
          />
          <View style={styles.row}>
            <Button label="Previous" kind="secondary" disabled={offset === 0} onPress={() => setOffset(Math.max(0, offset - limit))} />
            <Text style={styles.muted}>
              {data.count ? `${offset + 1}–${Math.min(offset + limit, data.count)} of ${data.count}` : ''}
            </Text>
            <Button label="Next" kind="secondary" disabled={offset + limit >= data.count} onPress={() => setOffset(offset + limit)} />
          </View>
        </>
      ) : null}
      {can('membership:upload') ? (
        <View style={{ gap: space.sm, marginTop: space.md }}>
          <Text style={styles.label}>Replace the membership from a CSV</Text>
          <Text style={styles.muted}>
            Columns: reference, age, salary, pot, contribution_rate (0.08 or 8%), retirement_age. The file replaces every current record; a file with any bad line changes nothing.
          </Text>
          <FileUpload label="Upload membership CSV" busy={upload.isPending} onFile={(f) => (setOffset(0), upload.mutate(f))} testID="upload-membership" />
          <UploadProblems error={upload.error} />
          {upload.data ? <Notice tone="success">{`${count(upload.data.count)} members stored, replacing ${count(upload.data.replaced)}.`}</Notice> : null}
        </View>
      ) : null}
    </Card>
  );
}

export default function MembersScreen() {
  const { scheme } = useCurrentScheme();
  const currency = scheme?.currency ?? 'GBP';
  return (
    <Screen title="Members" subtitle="The members projections are run for.">
      <Illustrative currency={currency} />
      <Membership currency={currency} />
    </Screen>
  );
}
