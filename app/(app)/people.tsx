import { useState } from 'react';
import { Text, View } from 'react-native';
import { Button, Card, Field, Loading, Notice, Screen, styles } from '@/components/ui';
import { RolePicker } from '@/components/RolePicker';
import { ROLE_LABELS, type Role } from '@/constants/permissions';
import { colors, space, type } from '@/constants/theme';
import { fieldError } from '@/hooks/api';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useSession } from '@/hooks/useSession';
import { useCancelInvitation, useChangeRole, useInvite, usePeople, useRemovePerson, useResendInvitation, useResetLink, type PendingInvitation, type Person } from '@/hooks/usePeople';
import { dateTime } from '@/figures';

export default function People() {
  const { scheme, can } = useCurrentScheme();
  if (!scheme) return <Loading />;
  if (!can('people:manage')) {
    return (
      <Screen title="People and roles">
        <Notice>Only the scheme administrator manages people.</Notice>
      </Screen>
    );
  }
  return <PeopleManager schemeId={scheme.id} schemeName={scheme.name} />;
}

function PeopleManager({ schemeId, schemeName }: { schemeId: string; schemeName: string }) {
  const people = usePeople(schemeId);
  const invite = useInvite(schemeId);
  const [email, setEmail] = useState('');
  const [role, setRole] = useState<Role>('trustee');
  return (
    <Screen title="People and roles" subtitle={`Who can use Keelson for ${schemeName}, and what each may do.`}>
      <Card title="Invite someone">
        <Field label="E-mail address" value={email} onChangeText={setEmail} autoCapitalize="none" inputMode="email" error={fieldError(invite.error, 'email')} testID="invite-email" />
        <RolePicker value={role} onChange={setRole} />
        {invite.error && !fieldError(invite.error, 'email') ? <Notice tone="error">{invite.error.message}</Notice> : null}
        <View style={styles.row}>
          <Button label="Send invitation" onPress={() => invite.mutate({ email: email.trim(), role }, { onSuccess: () => setEmail('') })} busy={invite.isPending} disabled={!email} />
        </View>
        {invite.data ? (
          <Notice tone="success">{`Invitation e-mailed to ${invite.data.emailedTo}. The link in it works once, within 7 days; if they already use Keelson they accept it by signing in with their own password.`}</Notice>
        ) : null}
      </Card>
      {people.isLoading ? <Loading /> : null}
      {people.error ? <Notice tone="error">{people.error.message}</Notice> : null}
      {people.data ? (
        <>
          <Card title={`People (${people.data.people.length})`}>
            {people.data.people.map((p) => (
              <PersonRow key={p.id} person={p} schemeId={schemeId} />
            ))}
          </Card>
          {people.data.pending.length ? (
            <Card title="Invitations not yet accepted">
              {/* Keyed by address: a re-sent invitation gets a new id but stays the same row. */}
              {people.data.pending.map((p) => (
                <PendingRow key={p.email} invitation={p} schemeId={schemeId} />
              ))}
            </Card>
          ) : null}
        </>
      ) : null}
    </Screen>
  );
}

function PersonRow({ person, schemeId }: { person: Person; schemeId: string }) {
  const { data: me } = useSession();
  const [editing, setEditing] = useState(false);
  const [role, setRole] = useState<Role>(person.role);
  const change = useChangeRole(schemeId);
  const remove = useRemovePerson(schemeId);
  const reset = useResetLink(schemeId);
  const self = me?.user.id === person.id;
  return (
    <View style={{ paddingVertical: space.md, borderTopWidth: 1, borderColor: colors.rule, gap: space.xs }} testID={`person-${person.email}`}>
      <View style={{ flexDirection: 'row', flexWrap: 'wrap', justifyContent: 'space-between', gap: space.sm }}>
        <View style={{ flexShrink: 1 }}>
          <Text style={[type.label, { color: colors.ink, fontSize: 16 }]}>
            {person.displayName}
            {self ? ' (you)' : ''}
          </Text>
          <Text style={styles.muted}>
            {person.email} · {ROLE_LABELS[person.role]}
            {person.active ? '' : ' · no password set yet'}
          </Text>
        </View>
        {!self && !editing ? (
          <View style={styles.row}>
            <Button kind="secondary" label="Change role" onPress={() => setEditing(true)} />
            <Button kind="secondary" label="Send reset link" onPress={() => reset.mutate(person.id)} busy={reset.isPending} />
          </View>
        ) : null}
      </View>
      {editing ? (
        <View style={{ gap: space.sm }}>
          <RolePicker value={role} onChange={setRole} label={`Role of ${person.displayName}`} />
          <View style={styles.row}>
            <Button label="Save role" onPress={() => change.mutate({ userId: person.id, role }, { onSuccess: () => setEditing(false) })} busy={change.isPending} />
            <Button kind="danger" label="Remove from scheme" onPress={() => remove.mutate(person.id)} busy={remove.isPending} />
            <Button kind="secondary" label="Cancel" onPress={() => setEditing(false)} />
          </View>
          {change.error || remove.error ? <Notice tone="error">{(change.error ?? remove.error)!.message}</Notice> : null}
        </View>
      ) : null}
      {reset.data ? (
        <Notice tone="success">{`A password-reset link was e-mailed to ${reset.data.emailedTo} (it works once, within 2 hours), and every session of theirs was signed out.`}</Notice>
      ) : null}
      {reset.error ? <Notice tone="error">{reset.error.message}</Notice> : null}
    </View>
  );
}

function PendingRow({ invitation: p, schemeId }: { invitation: PendingInvitation; schemeId: string }) {
  const resend = useResendInvitation(schemeId);
  const cancel = useCancelInvitation(schemeId);
  return (
    <View style={{ paddingVertical: space.sm, borderTopWidth: 1, borderColor: colors.rule, gap: space.xs }} testID={`invitation-${p.email}`}>
      <Text style={styles.body}>{p.email}</Text>
      <Text style={styles.muted}>
        {ROLE_LABELS[p.role]} · e-mailed {dateTime(p.createdAt)} · expires {dateTime(p.expiresAt)}
      </Text>
      <View style={styles.row}>
        <Button kind="secondary" label="Send again" onPress={() => resend.mutate(p.id)} busy={resend.isPending} />
        <Button kind="danger" label="Cancel invitation" onPress={() => cancel.mutate(p.id)} busy={cancel.isPending} />
      </View>
      {resend.data ? <Notice tone="success">{`Sent again to ${resend.data.emailedTo} with a new link; the earlier link no longer works.`}</Notice> : null}
      {resend.error || cancel.error ? <Notice tone="error">{(resend.error ?? cancel.error)!.message}</Notice> : null}
    </View>
  );
}
