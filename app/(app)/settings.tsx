import { useState } from 'react';
import { Text, View } from 'react-native';
import { Button, Card, Field, Loading, Notice, Screen, styles } from '@/components/ui';
import { Choices } from '@/components/Choices';
import { date, dateTime } from '@/figures';
import { space } from '@/constants/theme';
import { fieldError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useSaveSettings, useSettings, type SchemeSettingsView } from '@/hooks/useGovernance';

type Form = { approvalsRequired: '1' | '2'; signOffQuorum: string; reviewIntervalYears: string; nextReviewDue: string };
const formOf = (s: SchemeSettingsView): Form => ({ approvalsRequired: String(s.approvalsRequired) as '1' | '2', signOffQuorum: String(s.signOffQuorum), reviewIntervalYears: String(s.reviewIntervalYears), nextReviewDue: s.nextReviewDue ?? '' });

/** The scheme's governance settings: approvals, the sign-off quorum and the review cycle. */
export default function SettingsScreen() {
  const { scheme, can } = useCurrentScheme();
  const settings = useSettings(scheme?.id);
  const save = useSaveSettings(scheme?.id);
  const [form, setForm] = useState<Form | null>(null);
  const [localError, setLocalError] = useState<string | null>(null);
  if (!scheme || settings.isLoading) return <Loading />;
  if (settings.error || !settings.data) return <Screen title="Settings"><Notice tone="error">{settings.error?.message ?? 'Not found'}</Notice></Screen>;
  const s = settings.data;
  const f = form ?? formOf(s);
  const editable = can('settings:edit');
  const int = (v: string) => (/^\d+$/.test(v.trim()) ? Number(v) : Number.NaN);
  const submit = () => {
    setLocalError(null);
    const body = { approvalsRequired: Number(f.approvalsRequired), signOffQuorum: int(f.signOffQuorum), reviewIntervalYears: int(f.reviewIntervalYears), nextReviewDue: f.nextReviewDue.trim() || null };
    if (Number.isNaN(body.signOffQuorum) || Number.isNaN(body.reviewIntervalYears)) return setLocalError('Enter whole numbers for the quorum and the years between reviews.');
    save.mutate(body, { onSuccess: (n) => setForm(formOf(n)) });
  };

  return (
    <Screen title="Governance settings" subtitle={`How ${scheme.name} approves assumptions and options, and signs off its reviews. ${s.trustees} trustee${s.trustees === 1 ? '' : 's'} on the scheme.`}>
      {!editable ? <Notice>The scheme administrator keeps these settings on the board’s instruction, so the trustees they bind cannot relax them on their own.</Notice> : null}
      {save.isSuccess && !form ? <Notice tone="success">Settings saved.</Notice> : null}
      {save.error && !fieldError(save.error, 'signOffQuorum') && !fieldError(save.error, 'approvalsRequired') ? <Notice tone="error">{save.error.message}</Notice> : null}
      {localError ? <Notice tone="error">{localError}</Notice> : null}
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.lg }}>
        <Card title="Four-eyes approval" style={{ flexBasis: 320, flexGrow: 1 }}>
          <Text style={styles.body}>An assumption set or an option version is approved by a trustee other than the person who last changed it. Changing a draft withdraws the approvals it had.</Text>
          {editable ? (
            <Choices
              label="Trustee approvals needed"
              testID="approvals-required"
              value={f.approvalsRequired}
              onChange={(v) => setForm({ ...f, approvalsRequired: v })}
              options={[
                { value: '1', label: 'One trustee' },
                { value: '2', label: 'Two trustees' },
              ]}
            />
          ) : (
            <Text style={styles.body} testID="approvals-required">{`Approvals needed: ${s.approvalsRequired === 1 ? 'one trustee' : 'two trustees'}.`}</Text>
          )}
          {fieldError(save.error, 'approvalsRequired') ? <Text style={styles.error}>{fieldError(save.error, 'approvalsRequired')}</Text> : null}
        </Card>
        <Card title="Reviews of the default option" style={{ flexBasis: 320, flexGrow: 1 }}>
          {editable ? (
            <>
              <Field label="Trustees who must sign a review" value={f.signOffQuorum} onChangeText={(v) => setForm({ ...f, signOffQuorum: v })} inputMode="numeric" error={fieldError(save.error, 'signOffQuorum')} hint="The quorum; the review becomes final when this many trustees have signed." />
              <Field label="Years from one review to the next" value={f.reviewIntervalYears} onChangeText={(v) => setForm({ ...f, reviewIntervalYears: v })} inputMode="numeric" error={fieldError(save.error, 'reviewIntervalYears')} hint="Sets the next review date at sign-off, unless the review names one." />
              <Field label="Next review due (YYYY-MM-DD)" value={f.nextReviewDue} onChangeText={(v) => setForm({ ...f, nextReviewDue: v })} error={fieldError(save.error, 'nextReviewDue')} hint="For a scheme whose last review was made outside Keelson; a sign-off replaces it." />
            </>
          ) : (
            <>
              <Text style={styles.body}>{`Signatures needed: ${s.signOffQuorum} trustee${s.signOffQuorum === 1 ? '' : 's'}.`}</Text>
              <Text style={styles.body}>{`Reviews every ${s.reviewIntervalYears} year${s.reviewIntervalYears === 1 ? '' : 's'}.`}</Text>
              <Text style={styles.body}>{`Next review due: ${s.nextReviewDue ? date(s.nextReviewDue) : 'not set'}.`}</Text>
            </>
          )}
          <Text style={styles.muted}>Every trustee is e-mailed 90 and 30 days before the next review is due, and on the day.</Text>
        </Card>
      </View>
      {s.updatedAt ? <Text style={styles.muted}>{`Last changed${s.updatedBy ? ` by ${s.updatedBy}` : ''} on ${dateTime(s.updatedAt)}.`}</Text> : null}
      {editable ? <Button label="Save settings" onPress={submit} busy={save.isPending} testID="save-settings" /> : null}
    </Screen>
  );
}
