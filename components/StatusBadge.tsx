import { Text, View } from 'react-native';
import { colors, radius, space, type } from '@/constants/theme';

/** Draft (ochre) or approved (green): draft assumptions are marked wherever they appear. */
export function StatusBadge({ status }: { status: 'draft' | 'approved' }) {
  const draft = status === 'draft';
  return (
    <View style={{ alignSelf: 'flex-start', paddingHorizontal: space.sm, paddingVertical: 2, borderRadius: radius.sm, backgroundColor: draft ? colors.accentTint : colors.successTint }}>
      <Text style={[type.label, { color: draft ? colors.accentInk : colors.success }]}>{draft ? 'Draft' : 'Approved'}</Text>
    </View>
  );
}
