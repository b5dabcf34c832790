import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from './api';
import { useCurrentScheme } from './useCurrentScheme';
import { fileForm, type PickedFile } from './upload';
import type { Wire } from '@/types/wire';
import type { IllustrativeInput as ServerIllustrativeInput, IllustrativeRow } from '@/server/services/members';
import type { MembershipSummary as ServerMembershipSummary } from '@/server/services/membership';

export type IllustrativeMember = Pick<Wire<IllustrativeRow>, 'id' | keyof ServerIllustrativeInput>;
export type IllustrativeInput = ServerIllustrativeInput;
export type MembershipSummary = Wire<ServerMembershipSummary>;
export type MembershipRecord = MembershipSummary['rows'][number];

export const memberKeys = {
  illustrative: (schemeId: string) => ['illustrative-members', schemeId] as const,
  membership: (schemeId: string, offset: number) => ['membership', schemeId, offset] as const,
  membershipAll: (schemeId: string) => ['membership', schemeId] as const,
};

export function useIllustrativeMembers() {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  return useQuery({
    queryKey: memberKeys.illustrative(schemeId),
    queryFn: () => api<{ members: IllustrativeMember[] }>(`/schemes/${schemeId}/illustrative-members`).then((r) => r.members),
    enabled: !!schemeId,
  });
}

export function useSaveIllustrative() {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id?: string; input: IllustrativeInput }) =>
      id
        ? api<IllustrativeMember>(`/schemes/${schemeId}/illustrative-members/${id}`, { method: 'PUT', body: input })
        : api<IllustrativeMember>(`/schemes/${schemeId}/illustrative-members`, { body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: memberKeys.illustrative(schemeId) }),
  });
}

export function useDeleteIllustrative() {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api<{ ok: true }>(`/schemes/${schemeId}/illustrative-members/${id}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: memberKeys.illustrative(schemeId) }),
  });
}

export function useMembership(offset = 0, limit = 50, enabled = true) {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  return useQuery({
    queryKey: memberKeys.membership(schemeId, offset),
    queryFn: () => api<MembershipSummary>(`/schemes/${schemeId}/membership?offset=${offset}&limit=${limit}`),
    enabled: !!schemeId && enabled,
  });
}

/** Replaces the whole membership with the uploaded CSV (all or nothing). */
export function useUploadMembership() {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (file: PickedFile) => api<{ count: number; replaced: number; uploadedAt: string }>(`/schemes/${schemeId}/membership`, { form: fileForm(file) }),
    onSuccess: () => qc.invalidateQueries({ queryKey: memberKeys.membershipAll(schemeId) }),
  });
}
