import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Wire } from '@/types/wire';
import type { PairFigures as ServerPairFigures, StoredResult, StoredVariant as ServerStoredVariant } from '@/server/jobs/result';
import type { runForRole } from '@/server/services/runAccess';
import type { getRun, runChoices, summary } from '@/server/services/runs';
import type { RunRequestBody } from '@/schemas/runs';
import { api } from './api';

export type RunSummary = Wire<ReturnType<typeof summary>>;
export type RunStatus = RunSummary['status'];
export type PairFigures = Wire<ServerPairFigures>;
export type StoredVariant = Wire<ServerStoredVariant>;
export type RunResult = Wire<StoredResult>;
/** A run as the route answers: fund assumptions withheld from roles that may not read them. */
export type RunDetail = Wire<ReturnType<typeof runForRole<Awaited<ReturnType<typeof getRun>>>>>;
export type RunChoices = Wire<Awaited<ReturnType<typeof runChoices>>>;
export type RunRequest = RunRequestBody;

export const runKeys = {
  all: (schemeId: string) => ['schemes', schemeId, 'runs'] as const,
  list: (schemeId: string) => [...runKeys.all(schemeId), 'list'] as const,
  detail: (schemeId: string, runId: string) => [...runKeys.all(schemeId), 'detail', runId] as const,
  choices: (schemeId: string) => [...runKeys.all(schemeId), 'choices'] as const,
};

const active = (s?: RunStatus) => s === 'queued' || s === 'running';

export function useRuns(schemeId: string | undefined) {
  return useQuery({
    queryKey: runKeys.list(schemeId ?? ''),
    queryFn: () => api<{ runs: RunSummary[] }>(`/schemes/${schemeId}/runs`),
    enabled: !!schemeId,
    refetchInterval: (q) => (q.state.data?.runs.some((r) => active(r.status)) ? 1500 : false),
  });
}

/** One run; polls while it is queued or running so the progress bar moves. */
export function useRun(schemeId: string | undefined, runId: string | undefined) {
  const qc = useQueryClient();
  return useQuery({
    queryKey: runKeys.detail(schemeId ?? '', runId ?? ''),
    queryFn: async () => {
      const run = await api<RunDetail>(`/schemes/${schemeId}/runs/${runId}`);
      if (!active(run.status)) void qc.invalidateQueries({ queryKey: runKeys.list(schemeId!) });
      return run;
    },
    enabled: !!schemeId && !!runId,
    placeholderData: keepPreviousData,
    refetchInterval: (q) => (active(q.state.data?.status) ? 700 : false),
  });
}

export function useRunChoices(schemeId: string | undefined, enabled = true) {
  return useQuery({
    queryKey: runKeys.choices(schemeId ?? ''),
    queryFn: () => api<RunChoices>(`/schemes/${schemeId}/run-choices`),
    enabled: !!schemeId && enabled,
  });
}

export function useStartRun(schemeId: string | undefined) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: RunRequest) => api<RunSummary>(`/schemes/${schemeId}/runs`, { body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: runKeys.list(schemeId!) }),
  });
}

export function useRerun(schemeId: string | undefined) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (runId: string) => api<RunSummary>(`/schemes/${schemeId}/runs/${runId}/rerun`, { method: 'POST' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: runKeys.list(schemeId!) }),
  });
}
