import { Text, View } from 'react-native';
import { colors, space, type } from '@/constants/theme';

/** The caution every projection view and export carries. Keep the wording in one place. */
export const CAUTION_TEXT =
  'These figures are an illustration under stated assumptions. They are not a guarantee and not financial advice; outcomes can be lower. ' +
  "Decisions rest with the trustees, guided by the scheme's own advisers and local regulation.";

export function CautionNotice({ draft }: { draft?: boolean }) {
  return (
    <View accessibilityRole="summary" testID="caution-notice" style={{ borderWidth: 1, borderColor: colors.accent, backgroundColor: colors.accentTint, borderRadius: 8, padding: space.md, gap: space.xs }}>
      <Text style={[type.label, { color: '#7A4F12' }]}>Illustration only</Text>
      <Text style={[type.caption, { color: colors.ink }]}>{CAUTION_TEXT}</Text>
      {draft ? (
        <Text style={[type.label, { color: colors.danger }]}>Based on DRAFT assumptions that no trustee has approved.</Text>
      ) : null}
    </View>
  );
}
