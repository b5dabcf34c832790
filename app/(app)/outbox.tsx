import { Text, View } from 'react-native';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { colors, radius, space, type } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useOutbox, useRetryMessage, type OutboxMessage } from '@/hooks/useOutbox';
import { dateTime } from '@/figures';

const STATUS: Record<OutboxMessage['status'], { label: string; fg: string; bg: string }> = {
  queued: { label: 'Waiting to send', fg: colors.primary, bg: colors.primaryTint },
  retrying: { label: 'Failed, will retry', fg: colors.accentInk, bg: colors.accentTint },
  sent: { label: 'Sent', fg: colors.success, bg: colors.successTint },
  failed: { label: 'Failed', fg: colors.danger, bg: colors.dangerTint },
};

const when = (d: string | null) => (d ? dateTime(d) : '');

export default function Outbox() {
  const { scheme, can } = useCurrentScheme();
  const box = useOutbox(scheme?.id);
  if (!scheme) return <Loading />;
  if (!can('people:manage')) {
    return (
      <Screen title="Outbox">
        <Notice>Only the scheme administrator sees the outbox.</Notice>
      </Screen>
    );
  }
  return (
    <Screen title="Outbox" subtitle="Every e-mail Keelson has sent or is sending for this scheme, with its delivery status. One-use links are sent to their recipient only and never kept here.">
      {box.isLoading ? <Loading /> : null}
      {box.error ? <Notice tone="error">{box.error.message}</Notice> : null}
      {box.data && !box.data.messages.length ? <Notice>Nothing sent yet.</Notice> : null}
      {box.data?.messages.map((m) => <MessageCard key={m.id} m={m} schemeId={scheme.id} />)}
    </Screen>
  );
}

function MessageCard({ m, schemeId }: { m: OutboxMessage; schemeId: string }) {
  const retry = useRetryMessage(schemeId);
  const s = STATUS[m.status];
  return (
    <Card>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', gap: space.sm }}>
        <Text style={[type.label, { color: colors.ink, fontSize: 16, flexShrink: 1 }]}>{m.subject}</Text>
        <Text style={[type.label, { color: s.fg, backgroundColor: s.bg, paddingHorizontal: space.sm, borderRadius: radius.sm }]}>{s.label}</Text>
      </View>
      <Text style={styles.muted}>
        To {m.recipients.join(', ')} · queued {when(m.createdAt)}
        {m.sentAt ? ` · sent ${when(m.sentAt)}` : ''} · {m.attempts} {m.attempts === 1 ? 'attempt' : 'attempts'}
      </Text>
      {m.lastError ? <Text style={[type.caption, { color: colors.danger }]}>Last error: {m.lastError}</Text> : null}
      {m.body ? (
        <Text style={[type.caption, { color: colors.mutedInk }]} numberOfLines={6}>
          {m.body}
        </Text>
      ) : null}
      {m.attachments.length ? (
        <Text style={[type.caption, { color: colors.mutedInk }]}>
          Attached: {m.attachments.map((a) => `${a.filename} (${Math.max(1, Math.round(a.size / 1024))} KB)`).join(', ')}
          {m.kind === 'board-report' ? ' — the report itself is under Reports, for the roles that may read it.' : ''}
        </Text>
      ) : null}
      {m.status === 'failed' ? (
        <View style={styles.row}>
          <Button label="Send again" onPress={() => retry.mutate(m.id)} busy={retry.isPending} />
        </View>
      ) : null}
      {retry.error ? <Notice tone="error">{retry.error.message}</Notice> : null}
    </Card>
  );
}
