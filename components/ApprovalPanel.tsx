import { Text, View } from 'react-native';
import { colors, space, type } from '@/constants/theme';
import { date } from '@/figures';
import { Button, Notice, styles } from './ui';

type Approval = { userId: string | null; name: string; at: string };

/**
 * Four-eyes approval of a draft (an assumption set or an option version): who approved and
 * when, how many approvals the scheme needs, and the approve button — which explains itself
 * rather than failing when the signed-in trustee may not approve.
 */
export function ApprovalPanel(props: {
  what: string;
  status: 'draft' | 'approved';
  approvals: Approval[];
  required: number;
  lastEditor: string | null;
  youLastEdited: boolean;
  youApproved: boolean;
  canApprove: boolean;
  onApprove: () => void;
  busy?: boolean;
  error?: string | null;
}) {
  const { approvals, required } = props;
  return (
    <View style={{ gap: space.sm }} testID="approval-panel">
      {approvals.length ? (
        approvals.map((a, i) => (
          <Text key={i} style={styles.body}>
            ✓ Approved by <Text style={{ fontFamily: type.label.fontFamily }}>{a.name}</Text> on {date(a.at)}
          </Text>
        ))
      ) : (
        <Text style={styles.muted}>{props.status === 'approved' ? 'Approved before each approval was recorded by name.' : 'No approvals yet.'}</Text>
      )}
      {props.status === 'draft' ? (
        <>
          <Text style={[type.body, { color: colors.ink }]} testID="approval-count">
            {`${approvals.length} of ${required} approval${required === 1 ? '' : 's'} needed.`} {props.lastEditor ? `Last changed by ${props.lastEditor}; a trustee other than them approves it.` : 'A trustee approves it.'}
          </Text>
          {props.canApprove ? (
            props.youLastEdited ? (
              <Notice tone="warning">You made the last change to {props.what}, so another trustee must approve it (four-eyes rule).</Notice>
            ) : props.youApproved ? (
              <Notice>You have approved {props.what}; it needs another trustee’s approval.</Notice>
            ) : (
              <Button label={`Approve ${props.what}`} onPress={props.onApprove} busy={props.busy} testID="approve" />
            )
          ) : null}
          {props.error ? <Notice tone="error">{props.error}</Notice> : null}
        </>
      ) : null}
    </View>
  );
}
