import { useQuery } from '@tanstack/react-query';
import type { Role } from '@/constants/permissions';
import { api } from './api';

export type Overview = {
  scheme: { id: string; name: string; currency: string; role: Role };
  counts: { funds: number; options: number; illustrativeMembers: number | null; schemeMembers: number | null };
  assumptions: {
    latestApproved: { id: string; version: number; setAt: string; approvedBy: string | null; approvedAt: string | null } | null;
    drafts: { id: string; version: number; updatedAt: string; createdBy: string | null }[];
  } | null;
  runs: { id: string; status: 'queued' | 'running' | 'done' | 'failed'; progress: number; paths: number; assumptionsDraft: boolean; createdAt: string }[] | null;
  reports: { id: string; title: string; draft: boolean; createdAt: string }[] | null;
};

export const overviewKeys = { scheme: (schemeId: string) => ['schemes', schemeId, 'overview'] as const };

export function useOverview(schemeId: string | undefined) {
  return useQuery({ queryKey: overviewKeys.scheme(schemeId ?? ''), queryFn: () => api<Overview>(`/schemes/${schemeId}/overview`), enabled: !!schemeId });
}
