import { keepPreviousData, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ScenarioInput, Stress } from '@/simulation';
import type { Wire } from '@/types/wire';
import type { PairFigures as ServerPairFigures, StoredResult, StoredVariant as ServerStoredVariant } from '@/server/jobs/result';
import { api } from './api';

export type RunStatus = 'queued' | 'running' | 'done' | 'failed';

export type RunSummary = {
  id: string;
  status: RunStatus;
  progress: number;
  error: string | null;
  seed: number;
  paths: number;
  riskAversion: number;
  assumptionsDraft: boolean;
  assumptionSet: { id: string; version: number; status: 'draft' | 'approved'; setAt: string };
  /** Each option with the version it ran as (null for runs made before options were versioned). */
  options: { id: string; name: string; versionId: string | null; version: number | null; status: 'draft' | 'approved' | null }[];
  /** The scheme's current default when the run was made. */
  baselineOptionId: string | null;
  members: { id: string; label: string }[];
  stress: Stress | null;
  targetReplacementRatio: number;
  engineVersion: string | null;
  rerunOf: string | null;
  createdAt: string;
  finishedAt: string | null;
  /** Running, but its worker has stopped responding; it is retried shortly. */
  stalled: boolean;
};

export type PairFigures = Wire<ServerPairFigures>;
export type StoredVariant = Wire<ServerStoredVariant>;
export type RunResult = Wire<StoredResult>;
export type RunDetail = RunSummary & {
  input: { scenario: ScenarioInput; funds: { id: string; name: string }[]; members: { id: string; label: string; age: number; retirementAge: number }[] };
  result: RunResult | null;
};
/** What a run can be made of; each option as a run uses it (newest approved version) with a newer draft beside it. */
type ChoiceVersion = { id: string; version: number; status: 'draft' | 'approved'; name: string };
export type RunChoices = {
  assumptionSets: { id: string; version: number; status: 'draft' | 'approved'; setAt: string; fundOrder: string[] }[];
  options: { id: string; name: string; description: string; version: ChoiceVersion; draft: ChoiceVersion | null; isCurrentDefault: boolean }[];
  members: { id: string; label: string; age: number; retirementAge: number }[];
  funds: { id: string; name: string }[];
};
export type RunRequest = {
  assumptionSetId: string;
  optionIds: string[];
  /** Option id → a version to run instead of its newest approved one. */
  optionVersions?: Record<string, string>;
  memberIds: string[];
  paths: number;
  seed?: number;
  riskAversion: number;
  targetReplacementRatio: number;
  stress?: Stress;
};

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
