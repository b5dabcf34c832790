import { useState } from 'react';
import { Pressable, Text, View, useWindowDimensions } from 'react-native';
import { useRouter } from 'expo-router';
import { Button, Card, Loading, Notice, Screen, styles } from '@/components/ui';
import { GlidePathChart } from '@/components/GlidePathChart';
import { StatusBadge } from '@/components/StatusBadge';
import { Tag } from '@/components/Tag';
import { colors, space, type, WIDE_BREAKPOINT } from '@/constants/theme';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useFunds } from '@/hooks/useFunds';
import { useArchiveOption, useOptions, useSetCurrentDefault, type DefaultOption } from '@/hooks/useOptions';

/** Where an option's versions stand, in words. */
function versionLine(o: DefaultOption) {
  if (o.latest.status === 'approved') return `Version ${o.latest.version}, approved.`;
  return o.approved ? `Version ${o.approved.version} approved; draft version ${o.latest.version} awaits approval.` : `Draft version ${o.latest.version}: not yet approved.`;
}

export default function OptionsScreen() {
  const router = useRouter();
  const { can } = useCurrentScheme();
  const { width } = useWindowDimensions();
  const [showArchived, setShowArchived] = useState(false);
  const { data: options, isLoading, error } = useOptions(showArchived);
  const { data: funds } = useFunds();
  const archive = useArchiveOption();
  const setDefault = useSetCurrentDefault();
  const editable = can('options:edit');
  const columns = width >= 1100 ? 3 : width >= WIDE_BREAKPOINT ? 2 : 1;
  const current = options?.find((o) => o.isCurrentDefault);

  return (
    <Screen
      title="Default options"
      subtitle="Candidate default investment options: a single fund or a glide path that changes the mix as retirement nears. Every change is a new version, approved by a trustee other than the one who made it."
      actions={editable ? <Button label="New option" onPress={() => router.push('/options/new')} testID="new-option" /> : null}
    >
      {isLoading ? <Loading /> : null}
      {error ? <Notice tone="error">{error.message}</Notice> : null}
      {archive.error ? <Notice tone="error">{archive.error.message}</Notice> : null}
      {setDefault.error ? <Notice tone="error">{setDefault.error.message}</Notice> : null}
      {options ? (
        <Notice tone={current ? 'info' : 'warning'}>
          {current
            ? `${current.approved?.name ?? current.name} is the scheme's current default: comparisons show it first, as the baseline.`
            : 'No option is marked as the scheme’s current default. Mark the option members are in today, so comparisons show it as the baseline.'}
        </Notice>
      ) : null}
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', gap: space.lg }}>
        {(options ?? []).map((o) => (
          <Card key={o.id} title={o.name} style={{ width: columns === 1 ? '100%' : `${100 / columns - 2}%`, opacity: o.archived ? 0.7 : 1 }}>
            <View style={styles.row} testID={`option-tags-${o.name}`}>
              {o.isCurrentDefault ? <Tag label="Current default" tone="success" testID="current-default-tag" /> : null}
              <StatusBadge status={o.latest.status} />
              {o.archived ? <Tag label="Archived" tone="warning" /> : null}
            </View>
            <Text style={styles.muted}>{versionLine(o)}</Text>
            <Text style={styles.body} numberOfLines={3}>
              {o.description || 'No description.'}
            </Text>
            {funds ? <GlidePathChart funds={funds.funds} glidePath={o.glidePath} compact height={90} title={`${o.name} glide path`} /> : null}
            <Text style={styles.muted}>
              {o.glidePath.length === 1 ? 'A fixed mix.' : `${o.glidePath.length} points, from ${o.glidePath[0].yearsToRetirement} years to retirement to ${o.glidePath[o.glidePath.length - 1].yearsToRetirement}.`}
            </Text>
            <View style={styles.row}>
              <Button label={editable ? 'Open and edit' : 'Open'} kind="secondary" onPress={() => router.push(`/options/${o.id}`)} />
              {editable && !o.archived && !o.isCurrentDefault && o.approved ? (
                <Button label="Make current default" kind="secondary" busy={setDefault.isPending && setDefault.variables === o.id} onPress={() => setDefault.mutate(o.id)} testID={`make-default-${o.name}`} />
              ) : null}
              {editable && !o.isCurrentDefault ? <Button label={o.archived ? 'Restore' : 'Archive'} kind="secondary" onPress={() => archive.mutate({ id: o.id, archived: !o.archived })} /> : null}
            </View>
          </Card>
        ))}
      </View>
      <Pressable accessibilityRole="checkbox" accessibilityState={{ checked: showArchived }} onPress={() => setShowArchived(!showArchived)} style={{ minHeight: 44, justifyContent: 'center' }}>
        <Text style={[type.label, { color: colors.primary }]}>{showArchived ? 'Hide archived options' : 'Show archived options'}</Text>
      </Pressable>
    </Screen>
  );
}
