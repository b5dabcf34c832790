import { useState } from 'react';
import { Text, View } from 'react-native';
import { Link } from 'expo-router';
import { AuthFrame } from '@/components/AuthFrame';
import { Button, Field, Notice, styles } from '@/components/ui';
import { useSignIn } from '@/hooks/useSession';
import { colors, type } from '@/constants/theme';

export default function SignIn() {
  const [email, setEmail] = useState('');
  const [password, setPassword] = useState('');
  const signIn = useSignIn();
  const submit = () => signIn.mutate({ email: email.trim(), password });
  return (
    <AuthFrame title="Sign in" lead="Projections and comparisons of your scheme's default options.">
      {signIn.error ? <Notice tone="error">{signIn.error.message}</Notice> : null}
      {signIn.data && 'error' in signIn.data ? <Notice tone="warning">{signIn.data.message}</Notice> : null}
      <Field label="E-mail address" testID="email" value={email} onChangeText={setEmail} autoCapitalize="none" autoComplete="email" inputMode="email" />
      <Field label="Password" testID="password" value={password} onChangeText={setPassword} secureTextEntry autoComplete="current-password" onSubmitEditing={submit} />
      <Button testID="sign-in" label="Sign in" onPress={submit} busy={signIn.isPending} disabled={!email || !password} />
      <View style={{ marginTop: 16 }}>
        <Link href="/forgot-password" style={[type.body, { color: colors.primary }]}>
          Forgotten your password?
        </Link>
      </View>
      <Text style={[styles.muted, { marginTop: 24 }]}>Keelson is for scheme trustees, their advisers and scheme staff. Access is by invitation from your scheme administrator.</Text>
    </AuthFrame>
  );
}
