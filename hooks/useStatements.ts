import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Wire } from '@/types/wire';
import type { STATEMENT_PERCENTILES, StatementText, WHAT_IF } from '@/figures';
import type { exportSummary, ExportRequest as ServerExportRequest, illustrativeStatement, statementSources } from '@/server/services/statements';
import { api } from './api';

/** The sources route adds the rounding rules in words and the statement's fixed choices. */
export type StatementSources = Wire<Awaited<ReturnType<typeof statementSources>>> & {
  rounding: { pot: string; income: string };
  percentiles: typeof STATEMENT_PERCENTILES;
  whatIf: typeof WHAT_IF;
};
export type { StatementText };
export type StatementPreview = Wire<Awaited<ReturnType<typeof illustrativeStatement>>>;
export type StatementExport = Wire<ReturnType<typeof exportSummary>>;
export type ExportRequest = ServerExportRequest;

export type StatementChoice = { runId: string; optionId: string; memberId: string };

export const statementKeys = {
  sources: (schemeId: string) => ['schemes', schemeId, 'statements', 'sources'] as const,
  preview: (schemeId: string, c: StatementChoice) => ['schemes', schemeId, 'statements', 'preview', c.runId, c.optionId, c.memberId] as const,
  exports: (schemeId: string) => ['schemes', schemeId, 'statements', 'exports'] as const,
};

const query = (c: StatementChoice) => `runId=${encodeURIComponent(c.runId)}&optionId=${encodeURIComponent(c.optionId)}&memberId=${encodeURIComponent(c.memberId)}`;

export const statementFileUrl = (schemeId: string, c: StatementChoice, format: 'pdf' | 'csv') => `/api/schemes/${schemeId}/statements/file?${query(c)}&format=${format}`;
export const exportFileUrl = (schemeId: string, id: string) => `/api/schemes/${schemeId}/statement-exports/${id}/file`;

export function useStatementSources(schemeId: string | undefined) {
  return useQuery({ queryKey: statementKeys.sources(schemeId ?? ''), queryFn: () => api<StatementSources>(`/schemes/${schemeId}/statement-sources`), enabled: !!schemeId });
}

export function useStatementPreview(schemeId: string | undefined, c: StatementChoice | null) {
  return useQuery({
    queryKey: c ? statementKeys.preview(schemeId ?? '', c) : ['statements', 'none'],
    queryFn: () => api<StatementPreview>(`/schemes/${schemeId}/statements/preview?${query(c!)}`),
    enabled: !!schemeId && !!c,
  });
}

/** Exports, polled every second while one is still being made. */
export function useStatementExports(schemeId: string | undefined) {
  return useQuery({
    queryKey: statementKeys.exports(schemeId ?? ''),
    queryFn: () => api<{ exports: StatementExport[] }>(`/schemes/${schemeId}/statement-exports`),
    enabled: !!schemeId,
    refetchInterval: (q) => (q.state.data?.exports.some((e) => e.status === 'queued' || e.status === 'running') ? 1000 : false),
  });
}

export function useStartExport(schemeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: ExportRequest) => api<StatementExport>(`/schemes/${schemeId}/statement-exports`, { body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: statementKeys.exports(schemeId) }),
  });
}
