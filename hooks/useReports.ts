import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Wire } from '@/types/wire';
import type { ReportContent as ServerReportContent } from '@/server/reports/content';
import type { createReport, emailReport, getReport, listReports } from '@/server/services/reports';
import type { ReportRequest } from '@/schemas/runs';
import { api } from './api';
import type { RunSummary } from './useRuns';

export type ReportSummary = Wire<Awaited<ReturnType<typeof listReports>>[number]>;
export type ReportContent = Wire<ServerReportContent>;
export type ReportComparisonRow = ReportContent['comparison'][number];
export type ReportDetail = Wire<Awaited<ReturnType<typeof getReport>>>;
export type CreatedReport = Wire<Awaited<ReturnType<typeof createReport>>>;
export type EmailedReport = Wire<Awaited<ReturnType<typeof emailReport>>>;
/** A finished run offered as a report's source (the runs list's own summary). */
export type FinishedRun = RunSummary;

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
    mutationFn: (body: ReportRequest) => api<CreatedReport>(`/schemes/${schemeId}/reports`, { body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: reportKeys.list(schemeId) }),
  });
}

export function useEmailReport(schemeId: string) {
  return useMutation({ mutationFn: (id: string) => api<EmailedReport>(`/schemes/${schemeId}/reports/${id}/email`, { method: 'POST', body: {} }) });
}
