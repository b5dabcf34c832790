import { useMemo, useState } from 'react';
import { Pressable, Text, View, useWindowDimensions } from 'react-native';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { Button, Card, Field, Loading, Notice, Screen, styles } from '@/components/ui';
import { ApprovalPanel } from '@/components/ApprovalPanel';
import { GlidePathChart } from '@/components/GlidePathChart';
import { GlidePathEditor, type EditablePoint } from '@/components/GlidePathEditor';
import { GlidePathTable } from '@/components/GlidePathTable';
import { StatusBadge } from '@/components/StatusBadge';
import { Tag } from '@/components/Tag';
import { day } from '@/components/format';
import { colors, MIN_TOUCH, radius, space, type, WIDE_BREAKPOINT } from '@/constants/theme';
import { ApiError, fieldError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useFunds } from '@/hooks/useFunds';
import { useApproveVersion, useDiscardVersion, useOption, useOptionVersion, useSaveOption, useSetCurrentDefault, type OptionWithVersions } from '@/hooks/useOptions';
import { useSession } from '@/hooks/useSession';

type Form = { name: string; description: string; points: EditablePoint[] };

export default function OptionScreen() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return id === 'new' ? <NewOption /> : <ExistingOption id={id} />;
}

/** The name, description and glide-path editor with a live preview. */
function OptionForm({ form, setForm, error, saveLabel, onSave, busy, note }: { form: Form; setForm: (f: Form) => void; error: unknown; saveLabel: string; onSave: () => void; busy: boolean; note?: string }) {
  const { width } = useWindowDimensions();
  const { data: funds } = useFunds();
  const router = useRouter();
  if (!funds) return <Loading />;
  const wide = width >= WIDE_BREAKPOINT;
  const pathIssues = error instanceof ApiError ? error.issues.filter((i) => i.path.startsWith('glidePath')) : [];
  return (
    <View style={{ flexDirection: wide ? 'row' : 'column', gap: space.lg, alignItems: 'flex-start' }}>
      <View style={{ flex: 1, gap: space.lg, alignSelf: 'stretch' }}>
        <Card>
          <Field label="Name" value={form.name} onChangeText={(v) => setForm({ ...form, name: v })} error={fieldError(error, 'name')} />
          <Field label="Description" value={form.description} onChangeText={(v) => setForm({ ...form, description: v })} error={fieldError(error, 'description')} multiline style={{ minHeight: 80, paddingTop: space.sm }} />
        </Card>
        <Card title="Glide path">
          <GlidePathEditor funds={funds.funds} points={form.points} onChange={(points) => setForm({ ...form, points })} />
          {pathIssues.map((i, k) => (
            <Text key={k} role="alert" style={[styles.error]}>
              {i.path}: {i.message}
            </Text>
          ))}
        </Card>
      </View>
      <View style={{ flex: 1, gap: space.lg, alignSelf: 'stretch' }}>
        <Card title="Preview">
          <GlidePathChart funds={funds.funds} glidePath={form.points} title="Fund mix from 40 years to retirement" />
        </Card>
        {note ? <Notice>{note}</Notice> : null}
        <View style={styles.row}>
          <Button label={saveLabel} onPress={onSave} busy={busy} disabled={!form.name.trim()} testID="save-option" />
          <Button label="Back to options" kind="secondary" onPress={() => router.push('/options')} />
        </View>
      </View>
    </View>
  );
}

function NewOption() {
  const router = useRouter();
  const { data: funds } = useFunds();
  const save = useSaveOption();
  const [form, setForm] = useState<Form | null>(null);
  const f = form ?? (funds?.funds[0] ? { name: '', description: '', points: [{ yearsToRetirement: 0, weights: { [funds.funds[0].id]: 1 } }] } : null);
  if (!f) return <Loading />;
  return (
    <Screen title="New default option" subtitle="A new option starts as draft version 1; a trustee other than you approves it before runs use it as approved.">
      {save.error && !(save.error instanceof ApiError && save.error.status === 400) ? <Notice tone="error">{save.error.message}</Notice> : null}
      <OptionForm
        form={f}
        setForm={setForm}
        error={save.error}
        saveLabel="Create option"
        busy={save.isPending}
        onSave={() => save.mutate({ input: { name: f.name, description: f.description, glidePath: f.points } }, { onSuccess: (o) => router.replace(`/options/${o.id}`) })}
      />
    </Screen>
  );
}

function VersionChip({ label, selected, onPress, testID }: { label: string; selected: boolean; onPress: () => void; testID?: string }) {
  return (
    <Pressable
      role="radio"
      aria-checked={selected}
      onPress={onPress}
      testID={testID}
      style={{ minHeight: MIN_TOUCH, paddingHorizontal: space.md, justifyContent: 'center', borderRadius: radius.md, borderWidth: 1, borderColor: selected ? colors.primary : colors.rule, backgroundColor: selected ? colors.primaryTint : colors.surface }}
    >
      <Text style={[type.label, { color: selected ? colors.primary : colors.ink }]}>{label}</Text>
    </Pressable>
  );
}

function ExistingOption({ id }: { id: string }) {
  const params = useLocalSearchParams<{ version?: string }>();
  const router = useRouter();
  const { can } = useCurrentScheme();
  const { data: me } = useSession();
  const { data: option, isLoading, error } = useOption(id);
  const [chosen, setChosen] = useState<string | null>(null);
  const versionId = chosen ?? params.version ?? option?.latest.id;
  const version = useOptionVersion(id, versionId);
  const { data: funds } = useFunds();
  const save = useSaveOption();
  const approve = useApproveVersion();
  const discard = useDiscardVersion();
  const setDefault = useSetCurrentDefault();
  const [editing, setEditing] = useState<Form | null>(null);
  const [compareWith, setCompareWith] = useState<string | null>(null);
  const editable = can('options:edit');

  const others = useMemo(() => (option?.versions ?? []).filter((v) => v.id !== versionId), [option, versionId]);

  if (isLoading || !funds) return <Loading />;
  if (error || !option) return <Screen title="Option"><Notice tone="error">{error?.message ?? 'No such option.'}</Notice></Screen>;
  const v = version.data;
  const latest = option.latest;
  const draftPending = latest.status === 'draft';

  if (editing) {
    return (
      <Screen title={`Edit ${option.name}`} subtitle={draftPending ? `Changes draft version ${latest.version}.` : `Starts draft version ${latest.version + 1}; version ${latest.version} stays in force until it is approved.`}>
        {save.error && !(save.error instanceof ApiError && save.error.status === 400) ? <Notice tone="error">{save.error.message}</Notice> : null}
        <OptionForm
          form={editing}
          setForm={setEditing}
          error={save.error}
          saveLabel={draftPending ? `Save draft v${latest.version}` : `Save as draft v${latest.version + 1}`}
          busy={save.isPending}
          note={draftPending ? 'Saving withdraws any approvals the draft had: it must be approved again as changed.' : 'A trustee other than you approves the new version (four-eyes rule).'}
          onSave={() =>
            save.mutate(
              { id, input: { name: editing.name, description: editing.description, glidePath: editing.points } },
              {
                onSuccess: (o: OptionWithVersions) => {
                  setEditing(null);
                  setChosen(o.latest.id);
                },
              },
            )
          }
        />
        <Button label="Cancel" kind="secondary" onPress={() => setEditing(null)} />
      </Screen>
    );
  }

  return (
    <Screen
      title={option.name}
      subtitle={option.description || undefined}
      actions={
        editable && !option.archived ? <Button label={draftPending ? `Edit draft v${latest.version}` : 'Edit (new version)'} onPress={() => setEditing({ name: option.name, description: option.description, points: option.glidePath })} testID="edit-option" /> : null
      }
    >
      <View style={styles.row}>
        {option.isCurrentDefault ? <Tag label="Current default" tone="success" testID="current-default-tag" /> : null}
        {option.archived ? <Tag label="Archived" tone="warning" /> : null}
        {editable && !option.isCurrentDefault && option.approved && !option.archived ? <Button kind="secondary" label="Make current default" onPress={() => setDefault.mutate(id)} busy={setDefault.isPending} /> : null}
      </View>
      {setDefault.error ? <Notice tone="error">{setDefault.error.message}</Notice> : null}
      {save.isSuccess ? <Notice tone="success">Saved as draft version {latest.version}.</Notice> : null}

      <Card title="Versions">
        <Text style={styles.muted}>
          {option.approved ? `Runs use version ${option.approved.version} (approved) unless a run names another.` : 'No version is approved yet; runs use the draft and mark it.'}
        </Text>
        <View role="radiogroup" style={styles.row}>
          {option.versions.map((x) => (
            <VersionChip key={x.id} label={`v${x.version} · ${x.status === 'draft' ? 'draft' : 'approved'}`} selected={x.id === versionId} onPress={() => setChosen(x.id)} testID={`version-${x.version}`} />
          ))}
        </View>
        {others.length ? (
          <View style={{ gap: space.xs }}>
            <Text style={styles.label}>Compare this version with</Text>
            <View style={styles.row}>
              {others.map((x) => (
                <VersionChip key={x.id} label={`v${x.version}`} selected={compareWith === x.id} onPress={() => setCompareWith(x.id)} />
              ))}
              <Button kind="secondary" label="Compare side by side" disabled={!compareWith || !versionId} onPress={() => router.push(`/options/compare?option=${id}&a=${compareWith}&b=${versionId}`)} testID="compare-versions" />
            </View>
          </View>
        ) : null}
      </Card>

      {version.isLoading ? <Loading /> : null}
      {version.error ? <Notice tone="error">{version.error.message}</Notice> : null}
      {v ? (
        <>
          <Card title={`Version ${v.version}: ${v.name}`}>
            <StatusBadge status={v.status} />
            <Text style={styles.muted}>
              Drafted by {v.createdBy ?? '—'} on {day(v.createdAt)}
              {v.basedOnVersion ? ` from version ${v.basedOnVersion}` : ''} · last changed by {v.updatedBy ?? '—'} on {day(v.updatedAt)}
              {v.usedByRuns ? ` · used by ${v.usedByRuns} run${v.usedByRuns === 1 ? '' : 's'}` : ''}
            </Text>
            {v.description ? <Text style={styles.body}>{v.description}</Text> : null}
            <GlidePathChart funds={funds.funds} glidePath={v.glidePath} title="Fund mix from 40 years to retirement" />
            <GlidePathTable funds={funds.funds} points={v.glidePath} />
          </Card>
          <Card title="Approval">
            <ApprovalPanel
              what={`${v.name} v${v.version}`}
              status={v.status}
              approvals={v.approvals}
              required={v.approvalsRequired}
              lastEditor={v.updatedBy}
              youLastEdited={!!me && v.updatedById === me.user.id}
              youApproved={!!me && v.approvals.some((a) => a.userId === me.user.id)}
              canApprove={can('options:approve')}
              onApprove={() => approve.mutate({ optionId: id, versionId: v.id })}
              busy={approve.isPending}
              error={approve.error?.message}
            />
            {v.status === 'draft' && editable && option.versions.length > 1 ? (
              <Button kind="danger" label={`Discard draft v${v.version}`} busy={discard.isPending} onPress={() => discard.mutate({ optionId: id, versionId: v.id }, { onSuccess: () => setChosen(null) })} />
            ) : null}
            {discard.error ? <Notice tone="error">{discard.error.message}</Notice> : null}
          </Card>
        </>
      ) : null}
    </Screen>
  );
}
