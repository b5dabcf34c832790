import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Wire } from '@/types/wire';
import type { PairFigures as ServerPairFigures, StoredResult, StoredVariant as ServerStoredVariant } from '@/server/jobs/result';
import type { runForRole } from '@/server/services/runAccess';
import type { getRun, runChoices, runComparison, summary } from '@/server/services/runs';
import type { RunRequestBody } from '@/schemas/runs';
import { api, ApiError } from './api';

export type RunSummary = Wire<ReturnType<typeof summary>>;
export type RunStatus = RunSummary['status'];
export type PairFigures = Wire<ServerPairFigures>;
export type StoredVariant = Wire<ServerStoredVariant>;
export type RunResult = Wire<StoredResult>;
/** A run as the route answers: fund assumptions withheld from roles that may not read them. */
export type RunDetail = Wire<ReturnType<typeof runForRole<Awaited<ReturnType<typeof getRun>>>>>;
export type RunChoices = Wire<Awaited<ReturnType<typeof runChoices>>>;
export type RunRequest = RunRequestBody;
/** A run's exact figures at one λ (every path's pot): certainty equivalents, paired differences, ranking, break-even λs. */
export type RunComparison = Wire<Awaited<ReturnType<typeof runComparison>>>;

export const runKeys = {
  all: (schemeId: string) => ['schemes', schemeId, 'runs'] as const,
  list: (schemeId: string) => [...runKeys.all(schemeId), 'list'] as const,
  detail: (schemeId: string, runId: string) => [...runKeys.all(schemeId), 'detail', runId] as const,
  choices: (schemeId: string) => [...runKeys.all(schemeId), 'choices'] as const,
  comparison: (schemeId: string, runId: string, lambda: number, variant: 'base' | 'stressed') => [...runKeys.detail(schemeId, runId), 'comparison', variant, lambda] as const,
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

/**
 * A finished run's exact comparison at λ, from the server (every path's pot). Keeps showing the
 * previous λ's figures while the next are fetched, so the table does not flash as λ moves.
 * Runs stored before pots were kept answer 409 (no retry): the screen then shows the run's own λ.
 */
export function useRunComparison(schemeId: string | undefined, runId: string | undefined, lambda: number, variant: 'base' | 'stressed', enabled = true) {
  return useQuery({
    queryKey: runKeys.comparison(schemeId ?? '', runId ?? '', lambda, variant),
    queryFn: () => api<RunComparison>(`/schemes/${schemeId}/runs/${runId}/comparison?lambda=${encodeURIComponent(String(lambda))}&variant=${variant}`),
    enabled: !!schemeId && !!runId && enabled,
    placeholderData: keepPreviousData,
    staleTime: Infinity,
    retry: (failures, error) => failures < 2 && !(error instanceof ApiError && error.status < 500),
  });
}
