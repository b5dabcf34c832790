import { useState } from 'react';
import { Pressable, Text, View } from 'react-native';
import { colors, MIN_TOUCH, radius, space, type } from '@/constants/theme';

/** A one-use link shown to the administrator to pass on, with a copy button. */
export function CopyableLink({ link, note }: { link: string; note: string }) {
  const [copied, setCopied] = useState(false);
  return (
    <View style={{ gap: space.xs, padding: space.md, borderRadius: radius.md, backgroundColor: colors.primaryTint }}>
      <Text style={[type.caption, { color: colors.ink }]}>{note}</Text>
      <Text selectable testID="one-use-link" style={[type.caption, { color: colors.primary }]}>
        {link}
      </Text>
      <Pressable
        accessibilityRole="button"
        onPress={async () => {
          try {
            await globalThis.navigator?.clipboard?.writeText(link);
            setCopied(true);
          } catch {
            setCopied(false);
          }
        }}
        style={{ minHeight: MIN_TOUCH, justifyContent: 'center' }}
      >
        <Text style={[type.label, { color: colors.primary }]}>{copied ? 'Copied' : 'Copy link'}</Text>
      </Pressable>
    </View>
  );
}
