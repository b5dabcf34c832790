import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Role } from '@/constants/permissions';
import { api, ApiError } from './api';

export type SchemeAccess = { id: string; name: string; currency: string; role: Role };
export type Me = { user: { id: string; email: string; displayName: string }; schemes: SchemeAccess[] };

export const sessionKeys = { all: ['session'] as const, me: () => [...sessionKeys.all, 'me'] as const };

/** The signed-in user and their schemes, or null when signed out. */
export function useSession() {
  return useQuery({
    queryKey: sessionKeys.me(),
    queryFn: async () => {
      try {
        return await api<Me>('/auth/me');
      } catch (e) {
        if (e instanceof ApiError && e.status === 401) return null;
        throw e;
      }
    },
    staleTime: 60_000,
  });
}

/** A sign-in that needs e-mail confirmation first (after failed attempts, from a new address). */
export type SignInPending = { error: 'confirmation_needed'; message: string };

export function useSignIn() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; password: string }) => api<Me | SignInPending>('/auth/sign-in', { body }),
    onSuccess: (r) => {
      if ('error' in r) return;
      // Drop another user's cached data, but keep the session query its observers watch.
      qc.removeQueries({ predicate: (q) => q.queryKey[0] !== sessionKeys.all[0] });
      qc.setQueryData(sessionKeys.me(), r);
    },
  });
}

export function useSignOut() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<{ ok: true }>('/auth/sign-out', { method: 'POST' }),
    onSettled: () => {
      qc.removeQueries({ predicate: (q) => q.queryKey[0] !== sessionKeys.all[0] });
      qc.setQueryData(sessionKeys.me(), null);
    },
  });
}
