import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Wire } from '@/types/wire';
import type { GlidePathPoint } from '@/db/schema';
import type { OptionInput, OptionRow } from '@/server/services/options';
import { api } from './api';
import { useCurrentScheme } from './useCurrentScheme';

export type { GlidePathPoint, OptionInput };
export type DefaultOption = Wire<OptionRow>;

export const optionKeys = {
  all: (schemeId: string) => ['options', schemeId] as const,
  list: (schemeId: string, archived: boolean) => [...optionKeys.all(schemeId), 'list', archived] as const,
  detail: (schemeId: string, id: string) => [...optionKeys.all(schemeId), 'detail', id] as const,
};

export function useOptions(includeArchived = false) {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  return useQuery({
    queryKey: optionKeys.list(schemeId, includeArchived),
    queryFn: () => api<{ options: DefaultOption[] }>(`/schemes/${schemeId}/options?archived=${includeArchived ? 1 : 0}`).then((r) => r.options),
    enabled: !!schemeId,
  });
}

export function useOption(id: string | undefined) {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  return useQuery({ queryKey: optionKeys.detail(schemeId, id ?? ''), queryFn: () => api<DefaultOption>(`/schemes/${schemeId}/options/${id}`), enabled: !!schemeId && !!id });
}

export function useSaveOption() {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id?: string; input: OptionInput }) =>
      id ? api<DefaultOption>(`/schemes/${schemeId}/options/${id}`, { method: 'PUT', body: input }) : api<DefaultOption>(`/schemes/${schemeId}/options`, { body: input }),
    onSuccess: () => qc.invalidateQueries({ queryKey: optionKeys.all(schemeId) }),
  });
}

export function useArchiveOption() {
  const schemeId = useCurrentScheme().scheme?.id ?? '';
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, archived }: { id: string; archived: boolean }) => api<DefaultOption>(`/schemes/${schemeId}/options/${id}/archive`, { body: { archived } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: optionKeys.all(schemeId) }),
  });
}
