import { useMemo, useState } from 'react';
import { Text, View, useWindowDimensions } from 'react-native';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { Button, Card, Field, Loading, Notice, Screen, styles } from '@/components/ui';
import { Chip } from '@/components/Chip';
import { Choices } from '@/components/Choices';
import { DownloadLink } from '@/components/DownloadLink';
import { Tag } from '@/components/Tag';
import { count, date, dateTime } from '@/figures';
import { colors, space, type, WIDE_BREAKPOINT } from '@/constants/theme';
import { ApiError, fieldError } from '@/hooks/api';
import { useAssumptionSets } from '@/hooks/useAssumptions';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useOptions } from '@/hooks/useOptions';
import { useReports } from '@/hooks/useReports';
import { recordHref, useDiscardReview, useReview, useSignReview, useUpdateReview, type Review, type ReviewPatch } from '@/hooks/useReviews';
import { useRuns } from '@/hooks/useRuns';
import { useSession } from '@/hooks/useSession';

/** The review's editable fields as the form holds them: λ and the next review date as typed. */
type Form = Omit<Required<ReviewPatch>, 'title' | 'riskAversion' | 'nextReviewDue'> & { lambda: string; nextReviewDue: string };

const formOf = (r: Review): Form => ({
  assumptionSetId: r.assumptionSetId,
  optionVersionIds: r.optionVersions.map((v) => v.id),
  runIds: r.runs.map((x) => x.id),
  reportIds: r.reports.map((x) => x.id),
  decision: r.decision,
  chosenVersionId: r.chosenVersionId,
  lambda: r.riskAversion === null ? '' : String(r.riskAversion),
  lambdaCalibration: r.lambdaCalibration,
  reasons: r.reasons,
  dissent: r.dissent,
  nextReviewDue: r.nextReviewDue ?? '',
});

const toggle = (list: string[], id: string) => (list.includes(id) ? list.filter((x) => x !== id) : [...list, id]);

export default function ReviewScreen() {
  const { id } = useLocalSearchParams<{ id: string }>();
  const { scheme, can } = useCurrentScheme();
  const review = useReview(scheme?.id, id);
  if (!scheme || review.isLoading) return <Loading />;
  if (review.error || !review.data) return <Screen title="Review"><Notice tone="error">{review.error?.message ?? 'No such review.'}</Notice></Screen>;
  const r = review.data;
  const final = r.status === 'signed_off';
  return (
    <Screen
      title={r.title}
      subtitle={`Opened ${date(r.createdAt)}${r.openedBy ? ` by ${r.openedBy}` : ''}${r.updatedBy ? ` · last changed by ${r.updatedBy} on ${dateTime(r.updatedAt)}` : ''}`}
      actions={<DownloadLink href={recordHref(scheme.id, r.id)} label={final ? 'Decision record (PDF)' : 'Draft record (PDF)'} testID="record-pdf" />}
    >
      {final ? (
        <Notice tone="success">{`Signed off on ${date(r.signedOffAt)} by ${r.signOffs.map((s) => s.name).join(' and ')}. This record can no longer change; the next review is due on ${date(r.nextReviewDue)}.`}</Notice>
      ) : (
        <Tag label={`Open · ${r.signOffs.length} of ${r.quorum} signatures`} tone="warning" testID="review-status" />
      )}
      {!final && can('reviews:edit') ? <EditReview review={r} schemeId={scheme.id} /> : <ReadReview review={r} />}
      {!final ? <SignOff review={r} schemeId={scheme.id} /> : <Signatures review={r} />}
    </Screen>
  );
}

function Line({ label, value }: { label: string; value: string }) {
  return (
    <View style={{ gap: 2, paddingVertical: 4 }}>
      <Text style={styles.label}>{label}</Text>
      <Text style={styles.body}>{value}</Text>
    </View>
  );
}

/** The review as it reads (signed off, or for roles that do not edit it). */
function ReadReview({ review: r }: { review: Review }) {
  const { width } = useWindowDimensions();
  const wide = width >= WIDE_BREAKPOINT;
  return (
    <View style={{ flexDirection: wide ? 'row' : 'column', gap: space.lg, alignItems: 'flex-start' }}>
      <Card title="Decision" style={{ flex: 1, alignSelf: 'stretch' }}>
        <Text style={[type.title, { color: colors.ink }]} testID="decision-sentence">
          {r.decisionSentence}
        </Text>
        <Line label="Risk aversion (λ)" value={r.riskAversion === null ? 'Not stated' : String(r.riskAversion)} />
        <Line label="How the board arrived at λ" value={r.lambdaCalibration || 'Not stated'} />
        <Line label="Reasons, in the board’s words" value={r.reasons || 'Not stated'} />
        <Line label="Dissent" value={r.dissent || 'None recorded'} />
        {r.nextReviewDue ? <Line label="Next review due" value={date(r.nextReviewDue)} /> : null}
      </Card>
      <Card title="What the trustees considered" style={{ flex: 1, alignSelf: 'stretch' }}>
        <Line label="Assumptions" value={r.assumptionSet ? `Version ${r.assumptionSet.version}, set on ${date(r.assumptionSet.setAt)}; approved by ${r.assumptionSet.approvals.map((a) => a.name).join(' and ') || 'a trustee'}` : 'None named'} />
        <Line label="Option versions" value={r.optionVersions.map((v) => `${v.name} v${v.version}${v.id === r.chosenVersionId ? ' (chosen)' : ''}`).join('; ') || 'None named'} />
        <Line label="Projection runs" value={r.runs.map((x) => `${x.id.slice(0, 8)} (seed ${x.seed}, ${count(x.paths)} paths, engine ${x.engineVersion ?? '—'})`).join('; ') || 'None named'} />
        <Line label="Board reports" value={r.reports.map((x) => x.title).join('; ') || 'None named'} />
      </Card>
    </View>
  );
}

function EditReview({ review: r, schemeId }: { review: Review; schemeId: string }) {
  const router = useRouter();
  const { width } = useWindowDimensions();
  const update = useUpdateReview(schemeId, r.id);
  const discard = useDiscardReview(schemeId, r.id);
  const sets = useAssumptionSets();
  const options = useOptions(true);
  const runs = useRuns(schemeId);
  const reports = useReports(schemeId);
  const [form, setForm] = useState<Form | null>(null);
  const [localError, setLocalError] = useState<string | null>(null);
  const f = form ?? formOf(r);
  const set = (p: Partial<Form>) => setForm({ ...f, ...p });
  const wide = width >= WIDE_BREAKPOINT;

  // Each option's newest approved version, plus any version the review already names.
  const versionChoices = useMemo(() => {
    const out = new Map<string, { id: string; label: string }>();
    for (const v of r.optionVersions) out.set(v.id, { id: v.id, label: `${v.name} v${v.version}` });
    for (const o of options.data ?? []) if (o.approved && !o.archived) out.set(o.approved.id, { id: o.approved.id, label: `${o.approved.name} v${o.approved.version}` });
    return [...out.values()];
  }, [r.optionVersions, options.data]);
  const considered = versionChoices.filter((v) => f.optionVersionIds.includes(v.id));
  const doneRuns = (runs.data?.runs ?? []).filter((x) => x.status === 'done');

  const save = () => {
    setLocalError(null);
    const lambda = f.lambda.trim() === '' ? null : Number(f.lambda);
    if (lambda !== null && !Number.isFinite(lambda)) return setLocalError('λ must be a number, e.g. 3.');
    const patch: ReviewPatch = {
      assumptionSetId: f.assumptionSetId,
      optionVersionIds: f.optionVersionIds,
      runIds: f.runIds,
      reportIds: f.reportIds,
      decision: f.decision,
      chosenVersionId: f.decision === 'option' ? f.chosenVersionId : null,
      riskAversion: lambda,
      lambdaCalibration: f.lambdaCalibration,
      reasons: f.reasons,
      dissent: f.dissent,
      nextReviewDue: f.nextReviewDue.trim() || null,
    };
    update.mutate(patch, { onSuccess: () => setForm(null) });
  };

  return (
    <>
      <View style={{ flexDirection: wide ? 'row' : 'column', gap: space.lg, alignItems: 'flex-start' }}>
        <Card title="1. What the trustees considered" style={{ flex: 1, alignSelf: 'stretch' }}>
          <Text style={styles.label}>Approved assumption set</Text>
          <View style={styles.row}>
            {(sets.data ?? [])
              .filter((s) => s.status === 'approved')
              .map((s) => (
                <Chip key={s.id} label={`Version ${s.version} · ${date(s.setAt)}`} selected={f.assumptionSetId === s.id} onPress={() => set({ assumptionSetId: f.assumptionSetId === s.id ? null : s.id })} />
              ))}
          </View>
          <Text style={styles.label}>Option versions considered</Text>
          <View style={styles.row}>
            {versionChoices.map((v) => (
              <Chip key={v.id} label={v.label} selected={f.optionVersionIds.includes(v.id)} onPress={() => set({ optionVersionIds: toggle(f.optionVersionIds, v.id) })} />
            ))}
          </View>
          <Text style={styles.label}>Projection runs</Text>
          {runs.isLoading ? <Loading /> : null}
          {!runs.isLoading && !doneRuns.length ? <Text style={styles.muted}>No finished runs yet: start a comparison under Projections.</Text> : null}
          <View style={styles.row}>
            {doneRuns.map((x) => (
              <Chip
                key={x.id}
                label={`${dateTime(x.createdAt)} · ${x.options.length} options × ${x.members.length} members · seed ${x.seed}${x.stress ? ' · stress' : ''}`}
                note={x.assumptionsDraft ? 'DRAFT' : undefined}
                selected={f.runIds.includes(x.id)}
                onPress={() => set({ runIds: toggle(f.runIds, x.id) })}
              />
            ))}
          </View>
          <Text style={styles.label}>Board reports</Text>
          {reports.data && !reports.data.reports.length ? <Text style={styles.muted}>No board reports yet.</Text> : null}
          <View style={styles.row}>
            {(reports.data?.reports ?? []).map((x) => (
              <Chip key={x.id} label={`${x.title} · ${dateTime(x.createdAt)}`} selected={f.reportIds.includes(x.id)} onPress={() => set({ reportIds: toggle(f.reportIds, x.id) })} />
            ))}
          </View>
        </Card>
        <Card title="2. The decision" style={{ flex: 1, alignSelf: 'stretch' }}>
          <Choices
            label="What the board decided"
            testID="decision"
            value={f.decision}
            onChange={(v) => set({ decision: v })}
            options={[
              { value: 'option', label: 'Choose an option', hint: 'It becomes the current default at sign-off' },
              { value: 'no_change', label: 'No change', hint: r.currentDefault?.name ? `Keep ${r.currentDefault.name}` : 'Keep the current default' },
            ]}
          />
          {f.decision === 'option' ? (
            considered.length ? (
              <Choices label="Option chosen" testID="chosen-version" value={f.chosenVersionId} onChange={(v) => set({ chosenVersionId: v })} options={considered.map((v) => ({ value: v.id, label: v.label }))} />
            ) : (
              <Text style={styles.error}>Tick the option versions considered first.</Text>
            )
          ) : null}
          <Field label="Risk aversion λ the board used" value={f.lambda} onChangeText={(v) => set({ lambda: v })} inputMode="decimal" error={fieldError(update.error, 'riskAversion')} testID="review-lambda" />
          <Field
            label="How the board arrived at λ"
            value={f.lambdaCalibration}
            onChangeText={(v) => set({ lambdaCalibration: v })}
            multiline
            style={{ minHeight: 80, paddingTop: space.sm }}
            hint="For example the questions each trustee answered, or the break-even λ the board weighed."
            error={fieldError(update.error, 'lambdaCalibration')}
            testID="review-calibration"
          />
          <Field label="Reasons, in the board’s words" value={f.reasons} onChangeText={(v) => set({ reasons: v })} multiline style={{ minHeight: 100, paddingTop: space.sm }} error={fieldError(update.error, 'reasons')} testID="review-reasons" />
          <Field label="Dissent (if any)" value={f.dissent} onChangeText={(v) => set({ dissent: v })} multiline style={{ minHeight: 60, paddingTop: space.sm }} error={fieldError(update.error, 'dissent')} testID="review-dissent" />
          <Field
            label="Next review due (YYYY-MM-DD, optional)"
            value={f.nextReviewDue}
            onChangeText={(v) => set({ nextReviewDue: v })}
            hint={`Empty: ${r.reviewIntervalYears} years after sign-off.`}
            error={fieldError(update.error, 'nextReviewDue')}
          />
        </Card>
      </View>
      {localError ? <Notice tone="error">{localError}</Notice> : null}
      {update.error ? <Notice tone="error">{`${update.error.message} ${update.error instanceof ApiError ? update.error.issues.map((i) => `${i.path}: ${i.message}`).join('; ') : ''}`.trim()}</Notice> : null}
      {form && r.signOffs.length ? <Notice tone="warning">{`Saving withdraws the ${r.signOffs.length} signature${r.signOffs.length === 1 ? '' : 's'} given so far: they signed the review as it read before.`}</Notice> : null}
      <View style={styles.row}>
        <Button label="Save the review" onPress={save} busy={update.isPending} disabled={!form} testID="save-review" />
        {form ? <Button kind="secondary" label="Undo changes" onPress={() => setForm(null)} /> : null}
        <Button kind="danger" label="Discard this review" busy={discard.isPending} onPress={() => discard.mutate(undefined, { onSuccess: () => router.replace('/reviews') })} />
      </View>
    </>
  );
}

function Signatures({ review: r }: { review: Review }) {
  return (
    <Card title="Signatures">
      {r.signOffs.length ? (
        r.signOffs.map((s) => (
          <Text key={s.userId} style={styles.body} testID="signature">
            ✓ Signed by <Text style={{ fontFamily: type.label.fontFamily }}>{s.name}</Text> on {date(s.at)}
          </Text>
        ))
      ) : (
        <Text style={styles.muted}>No trustee has signed yet.</Text>
      )}
      <Text style={styles.muted}>{`The scheme needs ${r.quorum} trustee${r.quorum === 1 ? '' : 's'} to sign.`}</Text>
    </Card>
  );
}

function SignOff({ review: r, schemeId }: { review: Review; schemeId: string }) {
  const { can } = useCurrentScheme();
  const { data: me } = useSession();
  const sign = useSignReview(schemeId, r.id);
  const mine = !!me && r.signOffs.some((s) => s.userId === me.user.id);
  return (
    <Card title="3. Sign-off">
      {r.missing.length ? (
        <View style={{ gap: 2 }} testID="missing">
          <Text style={styles.body}>Before trustees can sign, the review must:</Text>
          {r.missing.map((m) => (
            <Text key={m} style={styles.body}>
              • {m}
            </Text>
          ))}
        </View>
      ) : (
        <Text style={styles.body}>{`Ready to sign. ${r.decisionSentence} When ${r.quorum} trustee${r.quorum === 1 ? ' has' : 's have'} signed, the review is final and cannot change.`}</Text>
      )}
      <Signatures review={r} />
      {sign.error ? <Notice tone="error">{sign.error.message}</Notice> : null}
      {can('reviews:sign') ? (
        <View style={styles.row}>
          {!mine ? <Button label="Sign the decision" onPress={() => sign.mutate(true)} busy={sign.isPending} disabled={r.missing.length > 0} testID="sign-review" /> : null}
          {mine ? <Button kind="secondary" label="Withdraw my signature" onPress={() => sign.mutate(false)} busy={sign.isPending} /> : null}
        </View>
      ) : null}
    </Card>
  );
}
