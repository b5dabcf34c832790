import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from './api';

export type StatementSources = {
  membershipCount: number;
  rounding: { pot: number; income: number };
  percentiles: { weak: number; typical: number; strong: number };
  runs: { id: string; finishedAt: string; draft: boolean; paths: number; assumptionSetVersion: number; options: { id: string; name: string }[]; members: { id: string; label: string; age: number; retirementAge: number }[] }[];
};

export type StatementText = {
  title: string;
  intro: string[];
  cases: { key: 'weak' | 'typical' | 'strong'; label: string; pot: string; income: string; sentence: string }[];
  income: string[];
  changes: string[];
  notes: string[];
  caution: string[];
};

export type StatementPreview = { figures: { draft: boolean; memberLabel: string; optionName: string }; text: StatementText };

export type StatementExport = {
  id: string;
  runId: string;
  optionId: string;
  scope: 'illustrative' | 'membership';
  format: 'pdf' | 'csv';
  status: 'queued' | 'running' | 'done' | 'failed';
  progress: number;
  memberCount: number;
  error: string | null;
  filename: string | null;
  createdAt: string;
};

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
    mutationFn: (body: { runId: string; optionId: string; scope: 'illustrative' | 'membership'; format: 'pdf' | 'csv' }) => api<StatementExport>(`/schemes/${schemeId}/statement-exports`, { body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: statementKeys.exports(schemeId) }),
  });
}
