import { Pressable, Text } from 'react-native';
import { Link } from 'expo-router';
import { Icon } from '@/components/Icon';
import { colors } from '@/constants/theme';
import { Card, Screen, styles } from '@/components/ui';
import { SchemePicker } from '@/components/SchemePicker';
import { ROLE_LABELS, can } from '@/constants/permissions';
import { NAV_ITEMS } from '@/constants/navigation';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useSession } from '@/hooks/useSession';

export default function Overview() {
  const { data: me } = useSession();
  const { scheme, schemes, setSchemeId } = useCurrentScheme();
  if (!scheme) {
    return (
      <Screen title="No scheme yet">
        <Card>
          <Text style={styles.body}>You have no role on any scheme. Ask your scheme administrator for an invitation.</Text>
        </Card>
      </Screen>
    );
  }
  const places = NAV_ITEMS.filter((i) => i.href !== '/' && can(scheme.role, i.permission));
  return (
    <Screen title={scheme.name} subtitle={`Signed in as ${me?.user.displayName} · ${ROLE_LABELS[scheme.role]}`}>
      <Card title="Your work here">
        {places.map((p) => (
          <Link key={p.href} href={p.href as never} asChild>
            <Pressable accessibilityRole="link" style={{ flexDirection: 'row', alignItems: 'center', gap: 12, minHeight: 44 }}>
              <Icon name={p.icon} color={colors.primary} />
              <Text style={[styles.body, { color: colors.primary }]}>{p.label}</Text>
            </Pressable>
          </Link>
        ))}
      </Card>
      {schemes.length > 1 ? (
        <Card title="Your schemes">
          <SchemePicker schemes={schemes} currentId={scheme.id} onChange={setSchemeId} />
        </Card>
      ) : null}
    </Screen>
  );
}
