import { useState } from 'react';
import { Text, View } from 'react-native';
import { Button, Card, Field, Loading, Notice, Screen, styles } from '@/components/ui';
import { DataTable } from '@/components/DataTable';
import { fieldError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useDeleteFund, useFunds, useSaveFund, type Fund } from '@/hooks/useFunds';

export default function FundsScreen() {
  const { can } = useCurrentScheme();
  const { data, isLoading, error } = useFunds();
  const save = useSaveFund();
  const remove = useDeleteFund();
  const [editing, setEditing] = useState<Fund | null>(null);
  const [name, setName] = useState('');
  const [assetClass, setAssetClass] = useState('');
  const editable = can('funds:edit');

  const start = (f: Fund | null) => {
    setEditing(f);
    setName(f?.name ?? '');
    setAssetClass(f?.assetClass ?? '');
    save.reset();
    remove.reset();
  };
  const submit = () => save.mutate({ id: editing?.id, name, assetClass }, { onSuccess: () => start(null) });

  return (
    <Screen title="Funds" subtitle={data ? `The scheme's investment funds, in ${data.currency}.` : undefined}>
      {isLoading ? <Loading /> : null}
      {error ? <Notice tone="error">{error.message}</Notice> : null}
      {data ? (
        <Card title={`${data.funds.length} funds`}>
          <DataTable
            label="Funds"
            rows={data.funds}
            rowKey={(f) => f.id}
            onRowPress={editable ? start : undefined}
            rowTone={(f) => (f.id === editing?.id ? 'highlight' : undefined)}
            columns={[
              { key: 'name', title: 'Fund', width: 170, render: (f) => f.name },
              { key: 'class', title: 'Asset class', width: 280, render: (f) => f.assetClass || '—' },
            ]}
          />
          {editable ? <Text style={styles.muted}>Choose a fund to rename it or change its description.</Text> : null}
        </Card>
      ) : null}
      {editable ? (
        <Card title={editing ? `Change ${editing.name}` : 'Add a fund'}>
          {save.error && !fieldError(save.error, 'name') && !fieldError(save.error, 'assetClass') ? <Notice tone="error">{save.error.message}</Notice> : null}
          {remove.error ? <Notice tone="error">{remove.error.message}</Notice> : null}
          <Field label="Name" value={name} onChangeText={setName} error={fieldError(save.error, 'name')} />
          <Field label="Asset class" value={assetClass} onChangeText={setAssetClass} error={fieldError(save.error, 'assetClass')} hint="What the fund holds, in a few words." />
          <View style={styles.row}>
            <Button label={editing ? 'Save changes' : 'Add fund'} onPress={submit} busy={save.isPending} disabled={!name.trim()} />
            {editing ? <Button label="Cancel" kind="secondary" onPress={() => start(null)} /> : null}
            {editing ? <Button label="Remove fund" kind="danger" onPress={() => remove.mutate(editing.id, { onSuccess: () => start(null) })} busy={remove.isPending} /> : null}
          </View>
          <Text style={styles.muted}>A fund that an assumption set or an option uses cannot be removed.</Text>
        </Card>
      ) : null}
    </Screen>
  );
}
