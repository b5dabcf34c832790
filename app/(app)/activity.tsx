import { Text, View } from 'react-native';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { colors, space, type } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useActivity, type AuditEvent } from '@/hooks/usePeople';
import { dateTime } from '@/figures';

/** Plain descriptions of audit actions; unknown actions show their code. */
const ACTION_TEXT: Record<string, string> = {
  'sign-in': 'signed in',
  'sign-in.failed': 'failed to sign in',
  'sign-out': 'signed out',
  'invitation.created': 'invited someone',
  'invitation.accepted': 'accepted an invitation',
  'role.changed': 'changed a role',
  'role.removed': 'removed someone from the scheme',
  'password.changed': 'changed their password',
  'password.reset': 'reset their password',
  'password-reset.issued': 'issued a password-reset link',
};

function describe(v: unknown): string {
  if (v === null || v === undefined) return '';
  const s = JSON.stringify(v);
  return s.length > 240 ? `${s.slice(0, 240)}…` : s;
}

export default function Activity() {
  const { scheme, can } = useCurrentScheme();
  const q = useActivity(can('audit:read') ? scheme?.id : undefined);
  if (!can('audit:read')) {
    return (
      <Screen title="Activity">
        <Notice>Only the scheme administrator reads the activity log.</Notice>
      </Screen>
    );
  }
  const events = q.data?.pages.flatMap((p) => p.events) ?? [];
  return (
    <Screen title="Activity" subtitle="Every sign-in and every change on this scheme: who, when, and what changed.">
      {q.isLoading ? <Loading /> : null}
      {q.error ? <Notice tone="error">{q.error.message}</Notice> : null}
      <Card>
        {events.length === 0 && !q.isLoading ? <Text style={styles.muted}>Nothing recorded yet.</Text> : null}
        {events.map((e) => (
          <EventRow key={e.id} e={e} />
        ))}
        {q.hasNextPage ? <Button kind="secondary" label="Show older" onPress={() => q.fetchNextPage()} busy={q.isFetchingNextPage} /> : null}
      </Card>
    </Screen>
  );
}

function EventRow({ e }: { e: AuditEvent }) {
  return (
    <View style={{ paddingVertical: space.sm, borderTopWidth: 1, borderColor: colors.rule }}>
      <Text style={[type.body, { color: colors.ink }]}>
        <Text style={{ fontFamily: 'SourceSans3_600SemiBold' }}>{e.actorEmail ?? 'Someone'}</Text> {ACTION_TEXT[e.action] ?? e.action}
        {e.entity ? ` · ${e.entity}` : ''}
      </Text>
      <Text style={styles.muted}>{dateTime(e.at)}</Text>
      {e.before !== null && e.before !== undefined ? <Text style={styles.muted}>Before: {describe(e.before)}</Text> : null}
      {e.after !== null && e.after !== undefined ? <Text style={styles.muted}>After: {describe(e.after)}</Text> : null}
    </View>
  );
}
