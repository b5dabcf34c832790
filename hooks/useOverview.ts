import { useQuery } from '@tanstack/react-query';
import type { Wire } from '@/types/wire';
import type { schemeOverview } from '@/server/services/overview';
import { api } from './api';

export type Overview = Wire<Awaited<ReturnType<typeof schemeOverview>>>;

export const overviewKeys = { scheme: (schemeId: string) => ['schemes', schemeId, 'overview'] as const };

export function useOverview(schemeId: string | undefined) {
  return useQuery({ queryKey: overviewKeys.scheme(schemeId ?? ''), queryFn: () => api<Overview>(`/schemes/${schemeId}/overview`), enabled: !!schemeId });
}
