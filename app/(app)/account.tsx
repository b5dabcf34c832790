import { useState } from 'react';
import { Text } from 'react-native';
import { Button, Card, Field, Notice, Screen, styles } from '@/components/ui';
import { SchemePicker } from '@/components/SchemePicker';
import { ROLE_LABELS } from '@/constants/permissions';
import { PASSWORD_RULE } from '@/constants/passwords';
import { fieldError } from '@/hooks/api';
import { useChangePassword } from '@/hooks/useAccount';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useSession } from '@/hooks/useSession';

export default function Account() {
  const { data: me } = useSession();
  const { scheme, schemes, setSchemeId } = useCurrentScheme();
  const change = useChangePassword();
  const [current, setCurrent] = useState('');
  const [next, setNext] = useState('');
  const [repeat, setRepeat] = useState('');
  const mismatch = repeat.length > 0 && repeat !== next;
  return (
    <Screen title="My account" subtitle={me ? `${me.user.displayName} · ${me.user.email}` : undefined}>
      <Card title="My schemes">
        {schemes.length > 1 ? (
          <SchemePicker schemes={schemes} currentId={scheme?.id} onChange={setSchemeId} />
        ) : (
          schemes.map((s) => (
            <Text key={s.id} style={styles.body}>
              {s.name} — {ROLE_LABELS[s.role]}
            </Text>
          ))
        )}
      </Card>
      <Card title="Change password">
        <Text style={styles.muted}>Changing it signs you out everywhere else.</Text>
        {change.data ? (
          <Notice tone="success">{`Your password is changed${change.data.otherSessionsEnded ? `, and ${change.data.otherSessionsEnded} other ${change.data.otherSessionsEnded === 1 ? 'session was' : 'sessions were'} signed out` : ''}. We have e-mailed you to confirm.`}</Notice>
        ) : null}
        <Field label="Current password" value={current} onChangeText={setCurrent} secureTextEntry autoComplete="current-password" error={fieldError(change.error, 'currentPassword')} />
        <Field label="New password" value={next} onChangeText={setNext} secureTextEntry autoComplete="new-password" hint={PASSWORD_RULE} error={fieldError(change.error, 'newPassword')} />
        <Field label="New password again" value={repeat} onChangeText={setRepeat} secureTextEntry autoComplete="new-password" error={mismatch ? 'does not match' : undefined} />
        <Button
          label="Change password"
          onPress={() =>
            change.mutate(
              { currentPassword: current, newPassword: next },
              {
                onSuccess: () => {
                  setCurrent('');
                  setNext('');
                  setRepeat('');
                },
              },
            )
          }
          busy={change.isPending}
          disabled={!current || !next || next !== repeat}
        />
      </Card>
    </Screen>
  );
}
