import { useState } from 'react';
import { Pressable, Text, View } from 'react-native';
import { Link, useRouter } from 'expo-router';
import { Button, Card, Field, Loading, Notice, Screen, styles } from '@/components/ui';
import { Tag } from '@/components/Tag';
import { date, dateTime } from '@/figures';
import { colors, MIN_TOUCH, space, type } from '@/constants/theme';
import { fieldError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useOverview } from '@/hooks/useOverview';
import { useOpenReview, useReviews } from '@/hooks/useReviews';

/** Reviews of the default option: open ones being prepared, and signed decision records. */
export default function Reviews() {
  const { scheme, can } = useCurrentScheme();
  const list = useReviews(can('reviews:read') ? scheme?.id : undefined);
  const overview = useOverview(scheme?.id);
  if (!scheme) return <Loading />;
  if (!can('reviews:read')) {
    return (
      <Screen title="Reviews">
        <Notice>Reviews of the default option are for trustees, the actuary, board reviewers and the administrator.</Notice>
      </Screen>
    );
  }
  const due = overview.data?.governance.nextReviewDue;
  return (
    <Screen title="Reviews of the default option" subtitle="Each review gathers the approved assumptions, the options considered, the runs and board reports, and the board's decision, signed by the scheme's quorum of trustees.">
      {due ? <Notice>{`The next review is due on ${date(due)}.`}</Notice> : null}
      {can('reviews:edit') ? <OpenReview schemeId={scheme.id} /> : null}
      <Card title="Reviews">
        {list.isLoading ? <Loading /> : null}
        {list.error ? <Notice tone="error">{list.error.message}</Notice> : null}
        {list.data && !list.data.length ? <Text style={styles.muted}>No reviews yet.</Text> : null}
        {list.data?.map((r) => (
          <Link key={r.id} href={`/reviews/${r.id}`} asChild>
            <Pressable accessibilityRole="link" testID="review-row" style={{ paddingVertical: space.md, borderTopWidth: 1, borderColor: colors.rule, minHeight: MIN_TOUCH, gap: 4 }}>
              <View style={[styles.row, { justifyContent: 'space-between' }]}>
                <Text style={[type.label, { color: colors.primary, fontSize: 16, flexShrink: 1 }]}>{r.title}</Text>
                {r.status === 'signed_off' ? <Tag label="Signed off" tone="success" /> : <Tag label={`Open · ${r.signatures} of ${r.quorum} signatures`} tone="warning" />}
              </View>
              <Text style={styles.muted}>
                {r.status === 'signed_off'
                  ? `Signed off ${date(r.signedOffAt)} · next review due ${date(r.nextReviewDue)}`
                  : `Opened ${date(r.createdAt)}${r.openedBy ? ` by ${r.openedBy}` : ''} · last changed ${dateTime(r.updatedAt)}`}
              </Text>
            </Pressable>
          </Link>
        ))}
      </Card>
    </Screen>
  );
}

function OpenReview({ schemeId }: { schemeId: string }) {
  const router = useRouter();
  const open = useOpenReview(schemeId);
  const [title, setTitle] = useState(`Default review ${new Date().getFullYear() + (new Date().getMonth() >= 9 ? 1 : 0)}`);
  return (
    <Card title="Open a review">
      <Text style={styles.body}>It starts with the newest approved assumptions and the approved version of every active option; add the runs and board reports the trustees looked at, then record the decision.</Text>
      <Field label="Title" value={title} onChangeText={setTitle} error={fieldError(open.error, 'title')} testID="review-title" />
      {open.error && !fieldError(open.error, 'title') ? <Notice tone="error">{open.error.message}</Notice> : null}
      <Button label="Open the review" busy={open.isPending} disabled={!title.trim()} onPress={() => open.mutate({ title }, { onSuccess: (r) => 'id' in r && router.push(`/reviews/${r.id}`) })} testID="open-review" />
    </Card>
  );
}
