import { useState } from 'react';
import { Text, View } from 'react-native';
import { Link } from 'expo-router';
import { AuthFrame } from '@/components/AuthFrame';
import { Button, Field, Notice } from '@/components/ui';
import { fieldError } from '@/hooks/api';
import { useForgotPassword } from '@/hooks/useAccount';
import { colors, type } from '@/constants/theme';

export default function ForgotPassword() {
  const [email, setEmail] = useState('');
  const forgot = useForgotPassword();
  return (
    <AuthFrame title="Reset your password" lead="We will send a link to set a new password. It works once, for two hours.">
      {forgot.data ? <Notice tone="success">{forgot.data.message}</Notice> : null}
      {forgot.error && !fieldError(forgot.error, 'email') ? <Notice tone="error">{forgot.error.message}</Notice> : null}
      <Field label="E-mail address" value={email} onChangeText={setEmail} autoCapitalize="none" inputMode="email" error={fieldError(forgot.error, 'email')} />
      <Button label="Send reset link" onPress={() => forgot.mutate(email.trim())} busy={forgot.isPending} disabled={!email} />
      <View style={{ marginTop: 16 }}>
        <Link href="/sign-in" style={[type.body, { color: colors.primary }]}>
          Back to sign in
        </Link>
      </View>
      <Text style={[type.caption, { color: colors.mutedInk, marginTop: 16 }]}>Your scheme administrator can also give you a reset link.</Text>
    </AuthFrame>
  );
}
