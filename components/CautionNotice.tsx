import { Text, View } from 'react-native';
import { colors, space, type } from '@/constants/theme';
import { CAUTION_TEXT, CAUTION_TITLE, DRAFT_NOTE } from '@/figures';

/** The caution every projection view carries; its words are figures/caution.ts, shared with PDFs, CSVs and e-mails. */
export function CautionNotice({ draft }: { draft?: boolean }) {
  return (
    <View accessibilityRole="summary" testID="caution-notice" style={{ borderWidth: 1, borderColor: colors.accent, backgroundColor: colors.accentTint, borderRadius: 8, padding: space.md, gap: space.xs }}>
      <Text style={[type.label, { color: colors.accentInk }]}>{CAUTION_TITLE}</Text>
      <Text style={[type.caption, { color: colors.ink }]}>{CAUTION_TEXT}</Text>
      {draft ? <Text style={[type.label, { color: colors.danger }]}>{DRAFT_NOTE}</Text> : null}
    </View>
  );
}
