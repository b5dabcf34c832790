import { useState, type ReactNode } from 'react';
import { Pressable, Text, View, useWindowDimensions } from 'react-native';
import { Link, usePathname } from 'expo-router';
import { NAV_ITEMS, PHONE_BAR_SIZE, type NavItem } from '@/constants/navigation';
import { colors, MIN_TOUCH, space, type, WIDE_BREAKPOINT } from '@/constants/theme';
import { ROLE_LABELS, can, type Role } from '@/constants/permissions';
import { Icon } from './Icon';
import { Wordmark } from './Wordmark';

type Scheme = { id: string; name: string; role: Role };
type Props = {
  children: ReactNode;
  scheme: Scheme | null;
  schemes: Scheme[];
  onSchemeChange: (id: string) => void;
  userName: string;
  onSignOut: () => void;
};

function isActive(pathname: string, href: string) {
  return href === '/' ? pathname === '/' : pathname === href || pathname.startsWith(`${href}/`);
}

/** One menu entry as a full-width row: on the spruce side navigation ("inverse") or in the phone's More panel ("plain"). */
function MenuRow({ item, active, tone, onPress }: { item: NavItem; active: boolean; tone: 'inverse' | 'plain'; onPress?: () => void }) {
  const inverse = tone === 'inverse';
  const fg = active ? colors.primary : inverse ? colors.paper : colors.ink;
  return (
    <Link href={item.href as never} asChild>
      <Pressable
        testID={`nav-${item.label}`}
        accessibilityRole="link"
        accessibilityState={{ selected: active }}
        onPress={onPress}
        style={{
          flexDirection: 'row',
          alignItems: 'center',
          gap: space.md,
          minHeight: MIN_TOUCH,
          paddingHorizontal: inverse ? space.md : space.lg,
          borderRadius: inverse ? 8 : 0,
          backgroundColor: inverse && active ? colors.paper : 'transparent',
        }}
      >
        <Icon name={item.icon} color={fg} />
        <Text style={[type.label, { fontSize: 16, color: fg }]}>{item.label}</Text>
      </Pressable>
    </Link>
  );
}

/** Phone first: bottom navigation under 768 px; a side navigation from 768 px. */
export function AppShell({ children, scheme, schemes, onSchemeChange, userName, onSignOut }: Props) {
  const { width } = useWindowDimensions();
  const wide = width >= WIDE_BREAKPOINT;
  const pathname = usePathname();
  const [moreOpen, setMoreOpen] = useState(false);
  const items = NAV_ITEMS.filter((i) => can(scheme?.role, i.permission));

  const switcher = schemes.length > 1 && (
    <View style={{ gap: space.xs }} testID="scheme-switcher">
      <Text style={[type.caption, { color: wide ? colors.onPrimaryMuted : colors.mutedInk }]}>Scheme</Text>
      {schemes.map((s) => (
        <Pressable
          key={s.id}
          accessibilityRole="radio"
          accessibilityState={{ checked: s.id === scheme?.id }}
          onPress={() => onSchemeChange(s.id)}
          style={{ minHeight: MIN_TOUCH, justifyContent: 'center', paddingHorizontal: space.sm, borderRadius: 6, backgroundColor: s.id === scheme?.id ? (wide ? colors.primaryPressed : colors.primaryTint) : 'transparent' }}
        >
          <Text style={[type.label, { color: wide ? colors.paper : colors.ink }]}>{s.name}</Text>
        </Pressable>
      ))}
    </View>
  );

  if (wide) {
    return (
      <View style={{ flex: 1, flexDirection: 'row', backgroundColor: colors.paper }}>
        <View role="navigation" style={{ width: 240, backgroundColor: colors.primary, padding: space.lg, gap: space.lg }}>
          <Wordmark inverse />
          {scheme ? (
            <View>
              <Text style={[type.label, { color: colors.paper }]}>{scheme.name}</Text>
              <Text style={[type.caption, { color: colors.onPrimaryMuted }]}>{ROLE_LABELS[scheme.role]}</Text>
            </View>
          ) : null}
          <View style={{ gap: 2 }}>
            {items.map((item) => (
              <MenuRow key={item.href} item={item} active={isActive(pathname, item.href)} tone="inverse" />
            ))}
          </View>
          {switcher}
          <View style={{ flex: 1 }} />
          <Text style={[type.caption, { color: colors.onPrimaryMuted }]}>Signed in as {userName}</Text>
          <Pressable accessibilityRole="button" onPress={onSignOut} style={{ flexDirection: 'row', alignItems: 'center', gap: space.sm, minHeight: MIN_TOUCH }}>
            <Icon name="signout" color={colors.paper} />
            <Text style={[type.label, { color: colors.paper }]}>Sign out</Text>
          </Pressable>
        </View>
        <View style={{ flex: 1 }}>{children}</View>
      </View>
    );
  }

  const byPhone = [...items].sort((a, b) => (a.phone ?? 99) - (b.phone ?? 99));
  const barItems = byPhone.length <= PHONE_BAR_SIZE + 1 ? byPhone : byPhone.slice(0, PHONE_BAR_SIZE);
  const moreItems = byPhone.filter((i) => !barItems.includes(i));
  const moreActive = moreItems.some((i) => isActive(pathname, i.href));
  const tab = (active: boolean) => ({ minWidth: 64, minHeight: 56, flex: 1, alignItems: 'center' as const, justifyContent: 'center' as const, paddingHorizontal: space.xs });
  const tabLabel = (active: boolean) => [type.caption, { color: active ? colors.primary : colors.mutedInk, fontFamily: active ? 'SourceSans3_600SemiBold' : 'SourceSans3_400Regular' }];

  return (
    <View style={{ flex: 1, backgroundColor: colors.paper }}>
      <View style={{ flexDirection: 'row', alignItems: 'center', justifyContent: 'space-between', paddingHorizontal: space.lg, paddingVertical: space.sm, borderBottomWidth: 1, borderColor: colors.rule, backgroundColor: colors.surface }}>
        <Wordmark />
        <Pressable accessibilityRole="button" accessibilityLabel="Sign out" onPress={onSignOut} style={{ minWidth: MIN_TOUCH, minHeight: MIN_TOUCH, alignItems: 'center', justifyContent: 'center' }}>
          <Icon name="signout" color={colors.primary} />
        </Pressable>
      </View>
      {scheme ? (
        <View style={{ paddingHorizontal: space.lg, paddingVertical: space.xs, backgroundColor: colors.primaryTint }}>
          <Text style={[type.caption, { color: colors.primary }]} numberOfLines={1}>
            {scheme.name} · {ROLE_LABELS[scheme.role]}
          </Text>
        </View>
      ) : null}
      <View style={{ flex: 1 }}>{children}</View>
      {moreOpen ? (
        <View role="navigation" aria-label="More" testID="more-menu" style={{ position: 'absolute', left: 0, right: 0, bottom: 57, backgroundColor: colors.surface, borderTopWidth: 1, borderColor: colors.rule, paddingVertical: space.sm, shadowColor: colors.shadow, shadowOpacity: 0.12, shadowRadius: 12 }}>
          {moreItems.map((item) => (
            <MenuRow key={item.href} item={item} active={isActive(pathname, item.href)} tone="plain" onPress={() => setMoreOpen(false)} />
          ))}
        </View>
      ) : null}
      <View role="navigation" style={{ flexDirection: 'row', borderTopWidth: 1, borderColor: colors.rule, backgroundColor: colors.surface }}>
        {barItems.map((item) => {
          const active = isActive(pathname, item.href);
          return (
            <Link key={item.href} href={item.href as never} asChild>
              <Pressable testID={`nav-${item.label}`} accessibilityRole="link" accessibilityState={{ selected: active }} onPress={() => setMoreOpen(false)} style={tab(active)}>
                <Icon name={item.icon} color={active ? colors.primary : colors.mutedInk} />
                <Text style={tabLabel(active)}>{item.label}</Text>
              </Pressable>
            </Link>
          );
        })}
        {moreItems.length ? (
          <Pressable testID="nav-More" accessibilityRole="button" accessibilityState={{ expanded: moreOpen }} onPress={() => setMoreOpen((o) => !o)} style={tab(moreActive || moreOpen)}>
            <Icon name="more" color={moreActive || moreOpen ? colors.primary : colors.mutedInk} />
            <Text style={tabLabel(moreActive || moreOpen)}>More</Text>
          </Pressable>
        ) : null}
      </View>
    </View>
  );
}
