import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from './api';

export type ReportSummary = { id: string; title: string; runId: string; riskAversion: number; draft: boolean; createdAt: string; createdBy: string | null };

export type ReportComparisonRow = {
  memberId: string;
  memberLabel: string;
  optionId: string;
  optionName: string;
  display: {
    meanReal: string;
    percentilesReal: Record<string, string>;
    probabilityReachingTarget: string;
    expectedShortfallReal: string;
    medianRealIncome: string;
    certaintyEquivalentPot: string;
    certaintyEquivalentReturn: string;
  };
};

export type ReportContent = {
  title: string;
  schemeName: string;
  createdOn: string;
  runId: string;
  draft: boolean;
  assumptionSet: { version: number; status: string; setAt: string; approvedOn: string | null; approvedBy: string | null };
  lambdaDisplay: string;
  percentiles: number[];
  options: { id: string; name: string }[];
  comparison: ReportComparisonRow[];
  breakEven: string[];
  monteCarlo: { lines: string[] };
  caution: string;
  draftText: string | null;
};

export type ReportDetail = ReportSummary & { content: ReportContent };
export type FinishedRun = { id: string; status: string; finishedAt: string | null; assumptionsDraft: boolean; assumptionSet: { version: number }; options: { name: string }[]; members: { label: string }[]; paths: number; riskAversion: number };

export const reportKeys = {
  list: (schemeId: string) => ['schemes', schemeId, 'reports'] as const,
  one: (schemeId: string, id: string) => ['schemes', schemeId, 'reports', id] as const,
  runs: (schemeId: string) => ['schemes', schemeId, 'reports', 'finished-runs'] as const,
};

/** Where a report's files download from (same-origin, the session cookie goes along). */
export const reportFileUrl = (schemeId: string, id: string, kind: 'pdf' | 'comparison.csv') => `/api/schemes/${schemeId}/reports/${id}/${kind}`;

export function useReports(schemeId: string | undefined) {
  return useQuery({ queryKey: reportKeys.list(schemeId ?? ''), queryFn: () => api<{ reports: ReportSummary[] }>(`/schemes/${schemeId}/reports`), enabled: !!schemeId });
}

export function useReport(schemeId: string | undefined, id: string | undefined) {
  return useQuery({ queryKey: reportKeys.one(schemeId ?? '', id ?? ''), queryFn: () => api<ReportDetail>(`/schemes/${schemeId}/reports/${id}`), enabled: !!schemeId && !!id });
}

/** Finished runs a report can be made from. */
export function useFinishedRuns(schemeId: string | undefined, enabled = true) {
  return useQuery({
    queryKey: reportKeys.runs(schemeId ?? ''),
    queryFn: async () => (await api<{ runs: FinishedRun[] }>(`/schemes/${schemeId}/runs?limit=50`)).runs.filter((r) => r.status === 'done'),
    enabled: !!schemeId && enabled,
  });
}

export function useCreateReport(schemeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { runId: string; title?: string; riskAversion?: number }) => api<ReportSummary>(`/schemes/${schemeId}/reports`, { body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: reportKeys.list(schemeId) }),
  });
}

export function useEmailReport(schemeId: string) {
  return useMutation({ mutationFn: (id: string) => api<{ messageId: string; recipients: string[]; status: string }>(`/schemes/${schemeId}/reports/${id}/email`, { method: 'POST', body: {} }) });
}
