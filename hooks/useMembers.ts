import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from './api';
import { useCurrentScheme } from './useCurrentScheme';
import { fileForm, type PickedFile } from './upload';

export type IllustrativeMember = { id: string; label: string; age: number; retirementAge: number; salary: number; salaryGrowth: number | null; contributionRate: number; pot: number };
export type IllustrativeInput = Omit<IllustrativeMember, 'id'>;
export type MembershipRecord = { id: number; reference: string; age: number; salary: number; pot: number; contributionRate: number; retirementAge: number };
export type MembershipSummary = {
  count: number;
  uploadedAt: string | null;
  ages: { band: string; count: number }[];
  totals: { salary: number; pot: number };
  medians: { age: number | null; salary: number | null; pot: number | null; contributionRate: number | null };
  rows: MembershipRecord[];
  offset: number;
  limit: number;
};

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
