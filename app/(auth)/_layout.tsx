import { Redirect, Slot, useGlobalSearchParams } from 'expo-router';
import { Loading } from '@/components/ui';
import { useSession } from '@/hooks/useSession';

/** Signed-out screens. A signed-in person goes on to `next` (only a one-use link page) or the overview. */
export default function AuthLayout() {
  const { data: me, isLoading } = useSession();
  const { next } = useGlobalSearchParams<{ next?: string }>();
  if (isLoading) return <Loading />;
  if (me) return <Redirect href={(typeof next === 'string' && next.startsWith('/link?token=') ? next : '/') as never} />;
  return <Slot />;
}
