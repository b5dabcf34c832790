import { Pressable, Text, View } from 'react-native';
import { Link } from 'expo-router';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { colors, MIN_TOUCH, space, type } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useActivity, type AuditEvent } from '@/hooks/usePeople';
import { dateTime } from '@/figures';

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
    <Screen title="Activity" subtitle="Every sign-in and every change on this scheme: who did what, to which object, and when.">
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

/** One event: the sentence (its object a link when it has one), the time, and what changed in words. */
function EventRow({ e }: { e: AuditEvent }) {
  const rest = e.sentence.slice(e.actor.length);
  const sentence = (
    <Text style={[type.body, { color: colors.ink }]} testID="activity-sentence">
      <Text style={{ fontFamily: type.label.fontFamily }}>{e.actor}</Text>
      {rest}
    </Text>
  );
  return (
    <View style={{ paddingVertical: space.sm, borderTopWidth: 1, borderColor: colors.rule, gap: 2 }}>
      {e.href ? (
        <Link href={e.href as never} asChild>
          <Pressable accessibilityRole="link" style={{ minHeight: MIN_TOUCH, justifyContent: 'center' }}>
            {sentence}
            <Text style={[type.caption, { color: colors.primary }]}>Open</Text>
          </Pressable>
        </Link>
      ) : (
        sentence
      )}
      {e.details.map((d, i) => (
        <Text key={i} style={styles.body}>
          {d}
        </Text>
      ))}
      <Text style={styles.muted}>{dateTime(e.at)}</Text>
    </View>
  );
}
