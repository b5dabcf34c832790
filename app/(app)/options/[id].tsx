import { useMemo } from 'react';
import { Text, View, useWindowDimensions } from 'react-native';
import { Controller, useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { showServerIssues, TextField } from '@/components/FormFields';
import { GlidePathChart } from '@/components/GlidePathChart';
import { GlidePathEditor, type EditablePoint } from '@/components/GlidePathEditor';
import { DataTable } from '@/components/DataTable';
import { percent } from '@/figures';
import { space, WIDE_BREAKPOINT } from '@/constants/theme';
import { ApiError } from '@/hooks/api';
import { OptionBody, type OptionBodyInput } from '@/schemas/options';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useFunds } from '@/hooks/useFunds';
import { useOption, useSaveOption, type DefaultOption, type OptionInput } from '@/hooks/useOptions';

export default function OptionScreen() {
  const { id } = useLocalSearchParams<{ id: string }>();
  const isNew = id === 'new';
  const { can } = useCurrentScheme();
  const { data: option, isLoading, error } = useOption(isNew ? undefined : id);
  const { data: funds } = useFunds();

  if (isLoading || !funds) return <Loading />;
  if (error) return <Screen title="Option"><Notice tone="error">{error.message}</Notice></Screen>;
  if (!isNew && !option) return <Loading />;
  if (!can('options:edit')) return <OptionView option={option!} funds={funds.funds} />;
  const start: OptionInput = option
    ? { name: option.name, description: option.description, glidePath: option.glidePath }
    : { name: '', description: '', glidePath: funds.funds[0] ? [{ yearsToRetirement: 0, weights: { [funds.funds[0].id]: 1 } }] : [] };
  return <OptionForm key={option?.id ?? 'new'} id={isNew ? undefined : id} start={start} funds={funds.funds} />;
}

function OptionView({ option, funds }: { option: DefaultOption; funds: { id: string; name: string }[] }) {
  const sorted = [...option.glidePath].sort((a, b) => b.yearsToRetirement - a.yearsToRetirement);
  return (
    <Screen title={option.name} subtitle={option.description}>
      <Card>
        <GlidePathChart funds={funds} glidePath={option.glidePath} title="Fund mix from 40 years to retirement" />
      </Card>
      <Card title="Points">
        <DataTable
          label="Glide path points"
          rows={sorted}
          rowKey={(p) => String(p.yearsToRetirement)}
          columns={[
            { key: 'y', title: 'Years to retirement', width: 110, align: 'right', render: (p) => String(p.yearsToRetirement) },
            ...funds.map((f) => ({ key: f.id, title: f.name, width: 120, align: 'right' as const, render: (p: EditablePoint) => percent(p.weights[f.id] ?? 0, 'share') })),
          ]}
        />
      </Card>
    </Screen>
  );
}

/** A new or existing option as a form, checked by the API's own schema (schemas/options.ts). */
function OptionForm({ id, start, funds }: { id?: string; start: OptionInput; funds: { id: string; name: string }[] }) {
  const router = useRouter();
  const { width } = useWindowDimensions();
  const save = useSaveOption();
  const { control, handleSubmit, setError, reset, formState } = useForm<OptionBodyInput, unknown, OptionInput>({ resolver: zodResolver(OptionBody), defaultValues: start, mode: 'onTouched' });
  const points = useWatch({ control, name: 'glidePath' });
  const name = useWatch({ control, name: 'name' });
  const wide = width >= WIDE_BREAKPOINT;
  const pathErrors = formState.errors.glidePath;
  const pointErrors = useMemo(
    () => (points ?? []).map((_, k) => ({ yearsToRetirement: pathErrors?.[k]?.yearsToRetirement?.message, weights: (pathErrors?.[k]?.weights as { message?: string } | undefined)?.message })),
    [points, pathErrors],
  );
  const elsewhere = save.error instanceof ApiError ? save.error.issues.filter((i) => i.path.startsWith('glidePath') && !/^glidePath\.\d+\.(yearsToRetirement|weights)/.test(i.path)) : [];

  const submit = handleSubmit((input) =>
    save.mutate(
      { id, input },
      {
        onSuccess: (o) => (reset({ name: o.name, description: o.description, glidePath: o.glidePath }), id ? undefined : router.replace(`/options/${o.id}`)),
        onError: (e) => void showServerIssues(e, setError, (path) => /^(name|description|glidePath\.\d+\.(yearsToRetirement|weights))/.test(path)),
      },
    ),
  );

  return (
    <Screen title={id ? `Edit ${start.name}` : 'New default option'}>
      {save.error && !(save.error instanceof ApiError && save.error.status === 400) ? <Notice tone="error">{save.error.message}</Notice> : null}
      {save.isSuccess && !formState.isDirty ? <Notice tone="success">Saved.</Notice> : null}
      <View style={{ flexDirection: wide ? 'row' : 'column', gap: space.lg, alignItems: 'flex-start' }}>
        <View style={{ flex: 1, gap: space.lg, alignSelf: 'stretch' }}>
          <Card>
            <TextField control={control} name="name" label="Name" />
            <TextField control={control} name="description" label="Description" multiline style={{ minHeight: 80, paddingTop: space.sm }} />
          </Card>
          <Card title="Glide path">
            <Controller control={control} name="glidePath" render={({ field }) => <GlidePathEditor funds={funds} points={field.value} onChange={field.onChange} errors={pointErrors} />} />
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
            <GlidePathChart funds={funds} glidePath={points ?? []} title="Fund mix from 40 years to retirement" />
          </Card>
          <View style={styles.row}>
            <Button label={id ? 'Save option' : 'Create option'} onPress={submit} busy={save.isPending} disabled={!String(name ?? '').trim()} testID="save-option" />
            <Button label="Back to options" kind="secondary" onPress={() => router.push('/options')} />
          </View>
        </View>
      </View>
    </Screen>
  );
}
