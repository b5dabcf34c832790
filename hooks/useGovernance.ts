import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Wire } from '@/types/wire';
import type { settingsView, SettingsInput } from '@/server/services/governance';
import { api } from './api';
import { overviewKeys } from './useOverview';

export type SchemeSettingsView = Wire<Awaited<ReturnType<typeof settingsView>>>;
export type { SettingsInput };

export const settingsKeys = { scheme: (schemeId: string) => ['schemes', schemeId, 'settings'] as const };

export function useSettings(schemeId: string | undefined) {
  return useQuery({ queryKey: settingsKeys.scheme(schemeId ?? ''), queryFn: () => api<SchemeSettingsView>(`/schemes/${schemeId}/settings`), enabled: !!schemeId });
}

export function useSaveSettings(schemeId: string | undefined) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: SettingsInput) => api<SchemeSettingsView>(`/schemes/${schemeId}/settings`, { method: 'PUT', body }),
    onSuccess: () => {
      void qc.invalidateQueries({ queryKey: settingsKeys.scheme(schemeId!) });
      void qc.invalidateQueries({ queryKey: overviewKeys.scheme(schemeId!) });
    },
  });
}
