import { View } from 'react-native';
import { ROLES, ROLE_LABELS, type Role } from '@/constants/permissions';
import { space } from '@/constants/theme';
import { Choices } from './Choices';

const ROLE_OPTIONS = ROLES.map((r) => ({ value: r, label: ROLE_LABELS[r] }));

/** One role out of the five, as a row of chips that wraps on phones. */
export function RolePicker({ value, onChange, label = 'Role' }: { value: Role; onChange: (r: Role) => void; label?: string }) {
  return (
    <View style={{ marginBottom: space.md }}>
      <Choices label={label} options={ROLE_OPTIONS} value={value} onChange={onChange} />
    </View>
  );
}
