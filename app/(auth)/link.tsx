import { useState } from 'react';
import { View } from 'react-native';
import { Link, useLocalSearchParams } from 'expo-router';
import { AuthFrame } from '@/components/AuthFrame';
import { Button, Field, Loading, Notice } from '@/components/ui';
import { fieldError } from '@/hooks/api';
import { useLinkInfo, useRedeemLink } from '@/hooks/useAccount';
import { ROLE_LABELS } from '@/constants/permissions';
import { colors, type } from '@/constants/theme';

/** Accept an invitation or reset a password from a one-use link (?token=…). */
export default function OneUseLink() {
  const { token } = useLocalSearchParams<{ token?: string }>();
  const info = useLinkInfo(token);
  const redeem = useRedeemLink(token ?? '');
  const [name, setName] = useState('');
  const [password, setPassword] = useState('');
  const [repeat, setRepeat] = useState('');
  const mismatch = repeat.length > 0 && repeat !== password;

  if (!token) return <AuthFrame title="Link not complete">{<Notice tone="error">This link is missing its code. Open the whole link from your message.</Notice>}</AuthFrame>;
  if (info.isLoading) return <Loading />;
  if (info.error) {
    return (
      <AuthFrame title="Link not valid">
        <Notice tone="error">{info.error.message}</Notice>
        <View style={{ marginTop: 16 }}>
          <Link href="/sign-in" style={[type.body, { color: colors.primary }]}>
            Go to sign in
          </Link>
        </View>
      </AuthFrame>
    );
  }
  const d = info.data!;
  const invitation = d.kind === 'invitation';
  if (redeem.data) {
    return (
      <AuthFrame title={invitation ? 'Welcome to Keelson' : 'Password changed'}>
        <Notice tone="success">{invitation ? `Your account ${redeem.data.email} is ready.` : 'Your new password is set.'}</Notice>
        <View style={{ marginTop: 16 }}>
          <Link href="/sign-in" style={[type.body, { color: colors.primary }]}>
            Sign in now
          </Link>
        </View>
      </AuthFrame>
    );
  }
  return (
    <AuthFrame
      title={invitation ? 'Accept your invitation' : 'Set a new password'}
      lead={invitation ? `${d.email} is invited to ${d.schemeName ?? 'a scheme'} as ${d.role ? ROLE_LABELS[d.role].toLowerCase() : 'a member'}.` : `For ${d.email}.`}
    >
      {redeem.error && !redeem.error.message.startsWith('Some fields') ? <Notice tone="error">{redeem.error.message}</Notice> : null}
      {invitation && d.newAccount ? <Field label="Your name" value={name} onChangeText={setName} autoComplete="name" error={fieldError(redeem.error, 'displayName')} /> : null}
      <Field label="New password" value={password} onChangeText={setPassword} secureTextEntry autoComplete="new-password" hint="At least 10 characters." error={fieldError(redeem.error, 'password')} />
      <Field label="New password again" value={repeat} onChangeText={setRepeat} secureTextEntry autoComplete="new-password" error={mismatch ? 'does not match' : undefined} />
      <Button
        label={invitation ? 'Create my account' : 'Set password'}
        onPress={() => redeem.mutate({ password, displayName: name.trim() || undefined })}
        busy={redeem.isPending}
        disabled={!password || mismatch || repeat !== password}
      />
    </AuthFrame>
  );
}
