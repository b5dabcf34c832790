import { useState } from 'react';
import { View } from 'react-native';
import { Link, useLocalSearchParams, useRouter } from 'expo-router';
import { AuthFrame } from '@/components/AuthFrame';
import { Button, Field, Loading, Notice } from '@/components/ui';
import { fieldError } from '@/hooks/api';
import { useAcceptInvitation, useConfirmSignIn, useLinkInfo, useRedeemLink, type LinkInfo } from '@/hooks/useAccount';
import { useSession, useSignOut } from '@/hooks/useSession';
import { ROLE_LABELS } from '@/constants/permissions';
import { PASSWORD_RULE } from '@/constants/passwords';
import { colors, type } from '@/constants/theme';

/**
 * A one-use link from an e-mail (?token=…): accept an invitation (a new account, or — signed
 * in with one's own password — an existing one), set a new password, or confirm a sign-in.
 * Outside the signed-out group, because a signed-in person accepts invitations here too.
 */
export default function OneUseLink() {
  const { token } = useLocalSearchParams<{ token?: string }>();
  const info = useLinkInfo(token);
  const session = useSession();

  if (!token) return <AuthFrame title="Link not complete">{<Notice tone="error">This link is missing its code. Open the whole link from your message.</Notice>}</AuthFrame>;
  if (info.isLoading || session.isLoading) return <Loading />;
  if (info.error) {
    return (
      <AuthFrame title="Link not valid">
        <Notice tone="error">{info.error.message}</Notice>
        <TextLink href="/sign-in" label="Go to sign in" />
      </AuthFrame>
    );
  }
  const d = info.data!;
  if (d.kind === 'sign_in_confirmation') return <ConfirmSignIn token={token} info={d} />;
  if (d.kind === 'invitation' && session.data) return <AcceptSignedIn token={token} info={d} signedInAs={session.data.user.email} />;
  return <SetPassword token={token} info={d} />;
}

function TextLink({ href, label }: { href: string; label: string }) {
  return (
    <View style={{ marginVertical: 16 }}>
      <Link href={href as never} style={[type.body, { color: colors.primary }]}>
        {label}
      </Link>
    </View>
  );
}

const invitationLead = (d: LinkInfo) => `${d.email} is invited to ${d.schemeName ?? 'a scheme'} as ${d.role ? ROLE_LABELS[d.role].toLowerCase() : 'a member'}.`;

function AcceptSignedIn({ token, info: d, signedInAs }: { token: string; info: LinkInfo; signedInAs: string }) {
  const accept = useAcceptInvitation(token);
  const signOut = useSignOut();
  const router = useRouter();
  if (accept.data) {
    return (
      <AuthFrame title="Invitation accepted">
        <Notice tone="success">{`You now have the role on ${d.schemeName ?? 'the scheme'}.`}</Notice>
        <Button label="Open Keelson" onPress={() => router.replace('/')} />
      </AuthFrame>
    );
  }
  if (signedInAs.toLowerCase() !== d.email) {
    return (
      <AuthFrame title="Accept your invitation" lead={invitationLead(d)}>
        <Notice tone="warning">{`You are signed in as ${signedInAs}. Sign out, then sign in as ${d.email} with that account's own password to accept.`}</Notice>
        <Button kind="secondary" label="Sign out" onPress={() => signOut.mutate()} busy={signOut.isPending} />
      </AuthFrame>
    );
  }
  return (
    <AuthFrame title="Accept your invitation" lead={invitationLead(d)}>
      {accept.error ? <Notice tone="error">{accept.error.message}</Notice> : null}
      <Button label="Accept invitation" onPress={() => accept.mutate()} busy={accept.isPending} testID="accept-invitation" />
    </AuthFrame>
  );
}

function ConfirmSignIn({ token, info: d }: { token: string; info: LinkInfo }) {
  const confirm = useConfirmSignIn(token);
  const router = useRouter();
  return (
    <AuthFrame title="Confirm your sign-in" lead={`Finish signing in as ${d.email} on this device.`}>
      {confirm.error ? <Notice tone="error">{confirm.error.message}</Notice> : null}
      <Button label="Confirm and sign in" onPress={() => confirm.mutate(undefined, { onSuccess: () => router.replace('/') })} busy={confirm.isPending} />
    </AuthFrame>
  );
}

function SetPassword({ token, info: d }: { token: string; info: LinkInfo }) {
  const redeem = useRedeemLink(token);
  const [name, setName] = useState('');
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const mismatch = repeat.length > 0 && repeat !== password;
  const invitation = d.kind === 'invitation';
  const signInHere = `/sign-in?next=${encodeURIComponent(`/link?token=${token}`)}`;
  if (redeem.data) {
    return (
      <AuthFrame title={invitation ? 'Welcome to Keelson' : 'Password changed'}>
        <Notice tone="success">{invitation ? `Your account ${redeem.data.email} is ready.` : 'Your new password is set, and every earlier session of yours is signed out.'}</Notice>
        <TextLink href="/sign-in" label="Sign in now" />
      </AuthFrame>
    );
  }
  const accountExists = (redeem.error as { code?: string } | null)?.code === 'account_exists';
  return (
    <AuthFrame title={invitation ? 'Accept your invitation' : 'Set a new password'} lead={invitation ? invitationLead(d) : `For ${d.email}.`}>
      {invitation ? (
        <Notice>
          Already use Keelson with this address? Sign in with your own password and accept there — nothing about your account changes but the new role.
        </Notice>
      ) : null}
      {invitation ? <TextLink href={signInHere} label="I already have an account: sign in to accept" /> : null}
      {redeem.error && !redeem.error.message.startsWith('Some fields') && !fieldError(redeem.error, 'password') ? <Notice tone="error">{redeem.error.message}</Notice> : null}
      {accountExists ? <TextLink href={signInHere} label="Sign in to accept" /> : null}
      {invitation ? <Field label="Your name" value={name} onChangeText={setName} autoComplete="name" error={fieldError(redeem.error, 'displayName')} /> : null}
      <Field label={invitation ? 'Choose a password' : 'New password'} value={password} onChangeText={setPassword} secureTextEntry autoComplete="new-password" hint={PASSWORD_RULE} error={fieldError(redeem.error, 'password')} />
      <Field label="The same password again" value={repeat} onChangeText={setRepeat} secureTextEntry autoComplete="new-password" error={mismatch ? 'does not match' : undefined} />
      <Button
        label={invitation ? 'Create my account' : 'Set password'}
        onPress={() => redeem.mutate({ password, displayName: name.trim() || undefined })}
        busy={redeem.isPending}
        disabled={!password || mismatch || repeat !== password}
      />
    </AuthFrame>
  );
}
