import { useMemo, useState } from 'react';
import { Text, View, useWindowDimensions } from 'react-native';
import { useLocalSearchParams, useRouter } from 'expo-router';
import { Button, Card, Field, Loading, Notice, Screen, styles } from '@/components/ui';
import { GlidePathChart } from '@/components/GlidePathChart';
import { GlidePathEditor, type EditablePoint } from '@/components/GlidePathEditor';
import { DataTable } from '@/components/DataTable';
import { percent } from '@/figures';
import { space, WIDE_BREAKPOINT } from '@/constants/theme';
import { ApiError, fieldError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useFunds } from '@/hooks/useFunds';
import { useOption, useSaveOption } from '@/hooks/useOptions';

export default function OptionScreen() {
  const { id } = useLocalSearchParams<{ id: string }>();
  const isNew = id === 'new';
  const router = useRouter();
  const { can } = useCurrentScheme();
  const { width } = useWindowDimensions();
  const { data: option, isLoading, error } = useOption(isNew ? undefined : id);
  const { data: funds } = useFunds();
  const save = useSaveOption();
  const editable = can('options:edit');
  const [edit, setEdit] = useState<{ name: string; description: string; points: EditablePoint[] } | null>(null);
  const form = useMemo(
    () => edit ?? (option ? { name: option.name, description: option.description, points: option.glidePath } : isNew && funds?.funds[0] ? { name: '', description: '', points: [{ yearsToRetirement: 0, weights: { [funds.funds[0].id]: 1 } }] } : null),
    [edit, option, isNew, funds],
  );

  if (isLoading || !funds) return <Loading />;
  if (error) return <Screen title="Option"><Notice tone="error">{error.message}</Notice></Screen>;
  if (!form) return <Loading />;
  const wide = width >= WIDE_BREAKPOINT;
  const sorted = [...form.points].sort((a, b) => b.yearsToRetirement - a.yearsToRetirement);
  const pathIssues = save.error instanceof ApiError ? save.error.issues.filter((i) => i.path.startsWith('glidePath')) : [];

  const submit = () =>
    save.mutate(
      { id: isNew ? undefined : id, input: { name: form.name, description: form.description, glidePath: form.points } },
      { onSuccess: (o) => (setEdit(null), isNew ? router.replace(`/options/${o.id}`) : undefined) },
    );

  const chart = <GlidePathChart funds={funds.funds} glidePath={form.points} title="Fund mix from 40 years to retirement" />;

  if (!editable) {
    return (
      <Screen title={option?.name ?? 'Option'} subtitle={option?.description}>
        <Card>{chart}</Card>
        <Card title="Points">
          <DataTable
            label="Glide path points"
            rows={sorted}
            rowKey={(p) => String(p.yearsToRetirement)}
            columns={[
              { key: 'y', title: 'Years to retirement', width: 110, align: 'right', render: (p) => String(p.yearsToRetirement) },
              ...funds.funds.map((f) => ({ key: f.id, title: f.name, width: 120, align: 'right' as const, render: (p: EditablePoint) => percent(p.weights[f.id] ?? 0, 'share') })),
            ]}
          />
        </Card>
      </Screen>
    );
  }

  return (
    <Screen title={isNew ? 'New default option' : `Edit ${option?.name ?? ''}`}>
      {save.error && !(save.error instanceof ApiError && save.error.status === 400) ? <Notice tone="error">{save.error.message}</Notice> : null}
      {save.isSuccess && !edit ? <Notice tone="success">Saved.</Notice> : null}
      <View style={{ flexDirection: wide ? 'row' : 'column', gap: space.lg, alignItems: 'flex-start' }}>
        <View style={{ flex: 1, gap: space.lg, alignSelf: 'stretch' }}>
          <Card>
            <Field label="Name" value={form.name} onChangeText={(v) => setEdit({ ...form, name: v })} error={fieldError(save.error, 'name')} />
            <Field label="Description" value={form.description} onChangeText={(v) => setEdit({ ...form, description: v })} error={fieldError(save.error, 'description')} multiline style={{ minHeight: 80, paddingTop: space.sm }} />
          </Card>
          <Card title="Glide path">
            <GlidePathEditor funds={funds.funds} points={form.points} onChange={(points) => setEdit({ ...form, points })} />
            {pathIssues.map((i, k) => (
              <Text key={k} role="alert" style={[styles.error]}>
                {i.path}: {i.message}
              </Text>
            ))}
          </Card>
        </View>
        <View style={{ flex: 1, gap: space.lg, alignSelf: 'stretch' }}>
          <Card title="Preview">{chart}</Card>
          <View style={styles.row}>
            <Button label={isNew ? 'Create option' : 'Save option'} onPress={submit} busy={save.isPending} disabled={!form.name.trim()} testID="save-option" />
            <Button label="Back to options" kind="secondary" onPress={() => router.push('/options')} />
          </View>
        </View>
      </View>
    </Screen>
  );
}
