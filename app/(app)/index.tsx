import type { ReactNode } from 'react';
import { Pressable, Text, View, useWindowDimensions, type ViewStyle } from 'react-native';
import { Link } from 'expo-router';
import { Icon } from '@/components/Icon';
import { Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { SchemePicker } from '@/components/SchemePicker';
import { ROLE_LABELS, can, type Role } from '@/constants/permissions';
import { colors, MIN_TOUCH, space, type, WIDE_BREAKPOINT } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useOverview, type Overview as OverviewData } from '@/hooks/useOverview';
import { useSession } from '@/hooks/useSession';
import { count, date, dateTime, daysBetween, isoDay, percent, plural } from '@/figures';

const STATUS_TEXT = { queued: 'Waiting to start', running: 'Running', done: 'Finished', failed: 'Failed' } as const;
const STATUS_COLOUR = { queued: colors.mutedInk, running: colors.accent, done: colors.success, failed: colors.danger } as const;

function Row({ href, children, testID }: { href: string; children: ReactNode; testID?: string }) {
  return (
    <Link href={href as never} asChild>
      <Pressable testID={testID} accessibilityRole="link" style={{ minHeight: MIN_TOUCH, justifyContent: 'center', paddingVertical: space.xs, borderTopWidth: 1, borderColor: colors.rule }}>
        {children}
      </Pressable>
    </Link>
  );
}

function Figure({ label, value }: { label: string; value: number | null }) {
  if (value === null) return null;
  return (
    <View style={{ minWidth: 120, flexGrow: 1 }}>
      <Text style={[type.heading, { color: colors.ink, fontVariant: ['tabular-nums'] }]}>{count(value)}</Text>
      <Text style={styles.muted}>{label}</Text>
    </View>
  );
}

/** Whole days from today (in UK time, as dates are shown) to an ISO date. */
const daysUntil = (iso: string) => daysBetween(isoDay(new Date()), iso);

/** The current default option and when the trustees next review it. */
function GovernanceCard({ o, role, style }: { o: OverviewData; role: Role; style: ViewStyle }) {
  const g = o.governance;
  const days = g.nextReviewDue ? daysUntil(g.nextReviewDue) : null;
  return (
    <Card title="Default option and review" style={style}>
      {g.currentDefault ? (
        <Row href={`/options/${g.currentDefault.optionId}`} testID="overview-current-default">
          <Text style={styles.body}>
            Current default: {g.currentDefault.name ?? 'an option'}
            {g.currentDefault.version ? ` (v${g.currentDefault.version})` : ''}
          </Text>
          <Text style={styles.muted}>The baseline every comparison shows first.</Text>
        </Row>
      ) : (
        <Text style={styles.body}>No option is marked as the current default.</Text>
      )}
      <Row href="/reviews" testID="overview-next-review">
        <Text style={[styles.body, days !== null && days <= 30 ? { color: days < 0 ? colors.danger : colors.accent } : null]}>
          {g.nextReviewDue ? `Next review due ${date(g.nextReviewDue)}` : 'No next review date is set'}
          {days === null ? '' : days > 0 ? ` · in ${plural(days, 'day')}` : days === 0 ? ' · today' : ` · ${plural(-days, 'day')} overdue`}
        </Text>
        <Text style={styles.muted}>
          {g.lastReview ? `Last review: ${g.lastReview.title}, signed off ${g.lastReview.signedOffAt ? date(g.lastReview.signedOffAt) : ''}` : 'No review signed off in Keelson yet.'}
          {g.openReviews ? ` · ${plural(g.openReviews, 'review')} open` : ''}
        </Text>
      </Row>
      {g.optionDrafts.map((d) => (
        <Row key={d.versionId} href={`/options/${d.optionId}?version=${d.versionId}`}>
          <Text style={[styles.body, { color: colors.accent }]}>
            {d.name}: draft version {d.version} — not yet approved
          </Text>
          <Text style={styles.muted}>{can(role, 'options:approve') ? 'Awaiting a trustee other than its last editor' : 'Awaiting a trustee’s approval'}</Text>
        </Row>
      ))}
      {can(role, 'reviews:edit') ? (
        <Row href="/reviews">
          <Text style={[type.label, { color: colors.primary, fontSize: 16 }]}>{g.openReviews ? 'Continue the open review' : 'Open a review'}</Text>
        </Row>
      ) : null}
    </Card>
  );
}

export default function Overview() {
  const { data: me } = useSession();
  const { scheme, schemes, setSchemeId } = useCurrentScheme();
  const { width } = useWindowDimensions();
  const overview = useOverview(scheme?.id);
  if (!scheme) {
    return (
      <Screen title="No scheme yet">
        <Card>
          <Text style={styles.body}>You have no role on any scheme. Ask your scheme administrator for an invitation.</Text>
        </Card>
      </Screen>
    );
  }
  const o = overview.data;
  const twoColumns = width >= WIDE_BREAKPOINT + 240;
  const column = { flexBasis: twoColumns ? '48%' : '100%', flexGrow: 1 } as const;
  return (
    <Screen title={scheme.name} subtitle={`Signed in as ${me?.user.displayName} · ${ROLE_LABELS[scheme.role]}`}>
      {overview.isLoading ? <Loading /> : null}
      {overview.error ? <Notice tone="error">{overview.error.message}</Notice> : null}
      {o ? (
        <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.lg }}>
          <Card title="The scheme in Keelson" style={column}>
            <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.lg }}>
              <Figure label="funds" value={o.counts.funds} />
              <Figure label="default options" value={o.counts.options} />
              <Figure label="illustrative members" value={o.counts.illustrativeMembers} />
              <Figure label="membership records" value={o.counts.schemeMembers} />
            </View>
          </Card>
          <GovernanceCard o={o} role={scheme.role} style={column} />
          {o.assumptions ? (
            <Card title="Assumptions" style={column}>
              {o.assumptions.latestApproved ? (
                <Row href={`/assumptions/${o.assumptions.latestApproved.id}`} testID="overview-approved-set">
                  <Text style={styles.body}>
                    Version {o.assumptions.latestApproved.version}, set at {date(o.assumptions.latestApproved.setAt)}
                  </Text>
                  <Text style={styles.muted}>
                    Approved{o.assumptions.latestApproved.approvedBy ? ` by ${o.assumptions.latestApproved.approvedBy}` : ''}
                    {o.assumptions.latestApproved.approvedAt ? ` on ${date(o.assumptions.latestApproved.approvedAt)}` : ''}
                  </Text>
                </Row>
              ) : (
                <Text style={styles.body}>No approved assumptions yet.</Text>
              )}
              {o.assumptions.drafts.map((d) => (
                <Row key={d.id} href={`/assumptions/${d.id}`}>
                  <Text style={[styles.body, { color: colors.accent }]}>Draft version {d.version} — not yet approved</Text>
                  <Text style={styles.muted}>
                    {d.createdBy ? `Started by ${d.createdBy}, ` : ''}last changed {dateTime(d.updatedAt)}
                    {can(scheme.role, 'assumptions:approve') ? ' · awaiting a trustee' : ''}
                  </Text>
                </Row>
              ))}
            </Card>
          ) : null}
          {o.runs ? (
            <Card title="Latest projections" style={column}>
              {o.runs.length === 0 ? <Text style={styles.body}>No projections yet.</Text> : null}
              {o.runs.map((r) => (
                <Row key={r.id} href={`/projections/${r.id}`}>
                  <Text style={styles.body}>
                    {dateTime(r.createdAt)} · {count(r.paths)} paths{r.assumptionsDraft ? ' · DRAFT assumptions' : ''}
                  </Text>
                  <Text style={[type.label, { color: STATUS_COLOUR[r.status] }]}>
                    {STATUS_TEXT[r.status]}
                    {r.status === 'running' ? ` · ${percent(r.progress, 'chance')}` : ''}
                  </Text>
                </Row>
              ))}
              {can(scheme.role, 'runs:create') ? (
                <Row href="/projections">
                  <Text style={[type.label, { color: colors.primary, fontSize: 16 }]}>Start a new comparison</Text>
                </Row>
              ) : null}
            </Card>
          ) : null}
          {o.reports ? (
            <Card title="Board reports" style={column}>
              {o.reports.length === 0 ? <Text style={styles.body}>No reports yet.</Text> : null}
              {o.reports.map((r) => (
                <Row key={r.id} href={`/reports/${r.id}`}>
                  <Text style={styles.body}>{r.title}</Text>
                  <Text style={styles.muted}>
                    {dateTime(r.createdAt)}
                    {r.draft ? ' · on DRAFT assumptions' : ''}
                  </Text>
                </Row>
              ))}
            </Card>
          ) : null}
        </View>
      ) : null}
      {schemes.length > 1 ? (
        <Card title="Your schemes">
          <SchemePicker schemes={schemes} currentId={scheme.id} onChange={setSchemeId} />
        </Card>
      ) : null}
      <View style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm }}>
        <Icon name="document" size={18} color={colors.mutedInk} />
        <Text style={styles.muted}>Projections in Keelson are illustrations under stated assumptions, not guarantees or advice.</Text>
      </View>
    </Screen>
  );
}
