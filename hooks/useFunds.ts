import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Wire } from '@/types/wire';
import type { FundRow } from '@/server/services/funds';
import { api } from './api';
import { useCurrentScheme } from './useCurrentScheme';

export type Fund = Wire<FundRow>;
export type FundList = { currency: string; funds: Fund[] };

export const fundKeys = {
  all: (schemeId: string) => ['funds', schemeId] as const,
};

/** The current scheme's funds. */
export function useFunds() {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  return useQuery({ queryKey: fundKeys.all(schemeId), queryFn: () => api<FundList>(`/schemes/${schemeId}/funds`), enabled: !!schemeId });
}

export function useSaveFund() {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...body }: { id?: string; name: string; assetClass: string }) =>
      id ? api<Fund>(`/schemes/${schemeId}/funds/${id}`, { method: 'PATCH', body }) : api<Fund>(`/schemes/${schemeId}/funds`, { body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: fundKeys.all(schemeId) }),
  });
}

export function useDeleteFund() {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api<{ ok: true }>(`/schemes/${schemeId}/funds/${id}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: fundKeys.all(schemeId) }),
  });
}
