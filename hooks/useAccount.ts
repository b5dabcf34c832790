import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Role } from '@/constants/permissions';
import { api } from './api';
import { sessionKeys, type Me } from './useSession';

export type LinkInfo = { kind: 'invitation' | 'password_reset' | 'sign_in_confirmation'; email: string; schemeName: string | null; role: Role | null; expiresAt: string };

export const accountKeys = { link: (token: string) => ['links', token] as const };

export function useLinkInfo(token: string | undefined) {
  return useQuery({ queryKey: accountKeys.link(token ?? ''), queryFn: () => api<LinkInfo>(`/auth/links/${encodeURIComponent(token!)}`), enabled: !!token });
}

export function useRedeemLink(token: string) {
  return useMutation({
    mutationFn: (body: { password: string; displayName?: string }) => api<{ ok: true; email: string; kind: string }>(`/auth/links/${encodeURIComponent(token)}`, { body }),
  });
}

/** Accepts an invitation as the signed-in person it was sent to. */
export function useAcceptInvitation(token: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<{ ok: true; schemeId: string; role: Role }>(`/auth/links/${encodeURIComponent(token)}/accept`, { method: 'POST', body: {} }),
    onSuccess: () => qc.invalidateQueries({ queryKey: sessionKeys.all }),
  });
}

/** Finishes a sign-in confirmed by e-mail: this browser is signed in. */
export function useConfirmSignIn(token: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<Me>(`/auth/links/${encodeURIComponent(token)}/confirm-sign-in`, { method: 'POST', body: {} }),
    onSuccess: (me) => {
      qc.removeQueries({ predicate: (q) => q.queryKey[0] !== sessionKeys.all[0] });
      qc.setQueryData(sessionKeys.me(), me);
    },
  });
}

export function useForgotPassword() {
  return useMutation({ mutationFn: (email: string) => api<{ ok: true; message: string }>('/auth/forgot-password', { body: { email } }) });
}

export function useChangePassword() {
  return useMutation({ mutationFn: (body: { currentPassword: string; newPassword: string }) => api<{ ok: true; otherSessionsEnded: number }>('/auth/password', { body }) });
}
