import type { ReactNode } from 'react';
import { ScrollView, Text, View } from 'react-native';
import { colors, radius, space, type } from '@/constants/theme';
import { Wordmark } from './Wordmark';

/** The frame of the signed-out screens: the wordmark above one card. */
export function AuthFrame({ title, lead, children }: { title: string; lead?: string; children: ReactNode }) {
  return (
    <ScrollView style={{ flex: 1, backgroundColor: colors.paper }} contentContainerStyle={{ flexGrow: 1, justifyContent: 'center', padding: space.lg }}>
      <View style={{ width: '100%', maxWidth: 420, alignSelf: 'center', gap: space.lg }}>
        <Wordmark size="large" />
        <View style={{ backgroundColor: colors.surface, borderRadius: radius.lg, borderWidth: 1, borderColor: colors.rule, padding: space.xl }}>
          <Text accessibilityRole="header" style={[type.heading, { color: colors.ink, marginBottom: space.xs }]}>
            {title}
          </Text>
          {lead ? <Text style={[type.body, { color: colors.mutedInk, marginBottom: space.lg }]}>{lead}</Text> : null}
          {children}
        </View>
      </View>
    </ScrollView>
  );
}
