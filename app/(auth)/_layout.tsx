import { Redirect, Slot } from 'expo-router';
import { Loading } from '@/components/ui';
import { useSession } from '@/hooks/useSession';

export default function AuthLayout() {
  const { data: me, isLoading } = useSession();
  if (isLoading) return <Loading />;
  if (me) return <Redirect href="/" />;
  return <Slot />;
}
