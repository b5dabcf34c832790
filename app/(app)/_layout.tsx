import { Redirect, Slot, useRouter } from 'expo-router';
import { AppShell } from '@/components/AppShell';
import { Loading, Notice } from '@/components/ui';
import { useCurrentScheme } from '@/hooks/useCurrentScheme';
import { useSession, useSignOut } from '@/hooks/useSession';

export default function SignedInLayout() {
  const { data: me, isLoading, error } = useSession();
  const { scheme, schemes, setSchemeId } = useCurrentScheme();
  const signOut = useSignOut();
  const router = useRouter();
  if (isLoading) return <Loading />;
  if (error) return <Notice tone="error">{error.message}</Notice>;
  if (!me) return <Redirect href="/sign-in" />;
  return (
    <AppShell
      scheme={scheme}
      schemes={schemes}
      onSchemeChange={setSchemeId}
      userName={me.user.displayName}
      onSignOut={() => signOut.mutate(undefined, { onSettled: () => router.replace('/sign-in') })}
    >
      <Slot />
    </AppShell>
  );
}
