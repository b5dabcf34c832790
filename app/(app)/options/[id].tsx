import { useMemo, useState } from 'react';
import { Text, View, useWindowDimensions } from 'react-native';
import { Controller, useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { ApprovalPanel } from '@/components/ApprovalPanel';
import { Chip } from '@/components/Chip';
import { showServerIssues, TextField } from '@/components/FormFields';
import { GlidePathChart } from '@/components/GlidePathChart';
import { GlidePathEditor } from '@/components/GlidePathEditor';
import { GlidePathTable } from '@/components/GlidePathTable';
import { StatusBadge } from '@/components/StatusBadge';
import { Tag } from '@/components/Tag';
import { date, plural } from '@/figures';
import { space, WIDE_BREAKPOINT } from '@/constants/theme';
import { ApiError } from '@/hooks/api';
import { OptionBody, type OptionBodyInput } from '@/schemas/options';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useFunds } from '@/hooks/useFunds';
import { useApproveVersion, useDiscardVersion, useOption, useOptionVersion, useSaveOption, useSetCurrentDefault, type OptionInput, type OptionWithVersions } from '@/hooks/useOptions';
import { useSession } from '@/hooks/useSession';

export default function OptionScreen() {
  const { id } = useLocalSearchParams<{ id: string }>();
  return id === 'new' ? <NewOption /> : <ExistingOption id={id} />;
}

/**
 * The name, description and glide-path editor with a live preview: a form checked by the API's
 * own schema (schemas/options.ts), with the API's field problems shown beside their fields.
 */
function OptionForm({ id, start, save, saveLabel, note, onSaved }: { id?: string; start: OptionInput; save: ReturnType<typeof useSaveOption>; saveLabel: string; note?: string; onSaved: (o: OptionWithVersions) => void }) {
  const { width } = useWindowDimensions();
  const { data: funds } = useFunds();
  const router = useRouter();
  const { control, handleSubmit, setError, formState } = useForm<OptionBodyInput, unknown, OptionInput>({ resolver: zodResolver(OptionBody), defaultValues: start, mode: 'onTouched' });
  const points = useWatch({ control, name: 'glidePath' });
  const name = useWatch({ control, name: 'name' });
  const pathErrors = formState.errors.glidePath;
  const pointErrors = useMemo(
    () => (points ?? []).map((_, k) => ({ yearsToRetirement: pathErrors?.[k]?.yearsToRetirement?.message, weights: (pathErrors?.[k]?.weights as { message?: string } | undefined)?.message })),
    [points, pathErrors],
  );
  if (!funds) return <Loading />;
  const wide = width >= WIDE_BREAKPOINT;
  const elsewhere = save.error instanceof ApiError ? save.error.issues.filter((i) => i.path.startsWith('glidePath') && !/^glidePath\.\d+\.(yearsToRetirement|weights)/.test(i.path)) : [];
  const submit = handleSubmit((input) =>
    save.mutate(
      { id, input },
      {
        onSuccess: onSaved,
        onError: (e) => void showServerIssues(e, setError, (path) => /^(name|description|glidePath\.\d+\.(yearsToRetirement|weights))/.test(path)),
      },
    ),
  );
  return (
    <>
      {save.error && !(save.error instanceof ApiError && save.error.status === 400) ? <Notice tone="error">{save.error.message}</Notice> : null}
      <View style={{ flexDirection: wide ? 'row' : 'column', gap: space.lg, alignItems: 'flex-start' }}>
        <View style={{ flex: 1, gap: space.lg, alignSelf: 'stretch' }}>
          <Card>
            <TextField control={control} name="name" label="Name" />
            <TextField control={control} name="description" label="Description" multiline style={{ minHeight: 80, paddingTop: space.sm }} />
          </Card>
          <Card title="Glide path">
            <Controller control={control} name="glidePath" render={({ field }) => <GlidePathEditor funds={funds.funds} points={field.value} onChange={field.onChange} errors={pointErrors} />} />
            {pathErrors?.message || pathErrors?.root?.message ? <Text role="alert" style={styles.error}>{pathErrors?.message ?? pathErrors?.root?.message}</Text> : null}
            {elsewhere.map((i, k) => (
              <Text key={k} role="alert" style={[styles.error]}>
                {i.path}: {i.message}
              </Text>
            ))}
          </Card>
        </View>
        <View style={{ flex: 1, gap: space.lg, alignSelf: 'stretch' }}>
          <Card title="Preview">
            <GlidePathChart funds={funds.funds} glidePath={points ?? []} title="Fund mix from 40 years to retirement" />
          </Card>
          {note ? <Notice>{note}</Notice> : null}
          <View style={styles.row}>
            <Button label={saveLabel} onPress={submit} busy={save.isPending} disabled={!String(name ?? '').trim()} testID="save-option" />
            <Button label="Back to options" kind="secondary" onPress={() => router.push('/options')} />
          </View>
        </View>
      </View>
    </>
  );
}

function NewOption() {
  const router = useRouter();
  const { data: funds } = useFunds();
  const save = useSaveOption();
  if (!funds) return <Loading />;
  const start: OptionInput = { name: '', description: '', glidePath: funds.funds[0] ? [{ yearsToRetirement: 0, weights: { [funds.funds[0].id]: 1 } }] : [] };
  return (
    <Screen title="New default option" subtitle="A new option starts as draft version 1; a trustee other than you approves it before runs use it as approved.">
      <OptionForm start={start} save={save} saveLabel="Create option" onSaved={(o) => router.replace(`/options/${o.id}`)} />
    </Screen>
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
  const [editing, setEditing] = useState<OptionInput | null>(null);
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
        <OptionForm
          id={id}
          start={editing}
          save={save}
          saveLabel={draftPending ? `Save draft v${latest.version}` : `Save as draft v${latest.version + 1}`}
          note={draftPending ? 'Saving withdraws any approvals the draft had: it must be approved again as changed.' : 'A trustee other than you approves the new version (four-eyes rule).'}
          onSaved={(o) => {
            setEditing(null);
            setChosen(o.latest.id);
          }}
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
        editable && !option.archived ? <Button label={draftPending ? `Edit draft v${latest.version}` : 'Edit (new version)'} onPress={() => setEditing({ name: option.name, description: option.description, glidePath: option.glidePath })} testID="edit-option" /> : null
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
            <Chip key={x.id} kind="radio" label={`v${x.version} · ${x.status === 'draft' ? 'draft' : 'approved'}`} selected={x.id === versionId} onPress={() => setChosen(x.id)} testID={`version-${x.version}`} />
          ))}
        </View>
        {others.length ? (
          <View style={{ gap: space.xs }}>
            <Text style={styles.label}>Compare this version with</Text>
            <View style={styles.row}>
              {others.map((x) => (
                <Chip key={x.id} kind="radio" label={`v${x.version}`} selected={compareWith === x.id} onPress={() => setCompareWith(x.id)} />
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
              Drafted by {v.createdBy ?? '—'} on {date(v.createdAt)}
              {v.basedOnVersion ? ` from version ${v.basedOnVersion}` : ''} · last changed by {v.updatedBy ?? '—'} on {date(v.updatedAt)}
              {v.usedByRuns ? ` · used by ${plural(v.usedByRuns, 'run')}` : ''}
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
