import { useMutation, useQuery } from '@tanstack/react-query';
import type { Role } from '@/constants/permissions';
import { api } from './api';

export type LinkInfo = { kind: 'invitation' | 'password_reset'; email: string; schemeName: string | null; role: Role | null; newAccount: boolean; expiresAt: string };

export const accountKeys = { link: (token: string) => ['links', token] as const };

export function useLinkInfo(token: string | undefined) {
  return useQuery({ queryKey: accountKeys.link(token ?? ''), queryFn: () => api<LinkInfo>(`/auth/links/${encodeURIComponent(token!)}`), enabled: !!token });
}

export function useRedeemLink(token: string) {
  return useMutation({
    mutationFn: (body: { password: string; displayName?: string }) => api<{ ok: true; email: string; kind: string }>(`/auth/links/${encodeURIComponent(token)}`, { body }),
  });
}

export function useForgotPassword() {
  return useMutation({ mutationFn: (email: string) => api<{ ok: true; message: string }>('/auth/forgot-password', { body: { email } }) });
}

export function useChangePassword() {
  return useMutation({ mutationFn: (body: { currentPassword: string; newPassword: string }) => api<{ ok: true }>('/auth/password', { body }) });
}
