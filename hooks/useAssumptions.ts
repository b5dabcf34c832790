import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from './api';
import { useCurrentScheme } from './useCurrentScheme';
import { fileForm, type PickedFile } from './upload';
import type { Wire } from '@/types/wire';
import type {
  AssumptionContent,
  AssumptionSetDetail,
  AssumptionSetSummary as ServerSummary,
  FundAssumptionInput,
  SetComparison as ServerComparison,
} from '@/server/services/assumptions';
import type { HistorySuggestion as ServerSuggestion } from '@/server/services/history';

export type FundAssumption = FundAssumptionInput;
export type { AssumptionContent };
export type AssumptionSetSummary = Wire<ServerSummary>;
export type AssumptionSet = Wire<AssumptionSetDetail>;
export type SetComparison = Wire<ServerComparison>;

/** The route adds the latest approved version beside the suggestion. */
export type HistorySuggestion = Wire<ServerSuggestion> & { current: { id: string; version: number; funds: AssumptionSet['funds']; correlations: number[][] } | null };

export const assumptionKeys = {
  all: (schemeId: string) => ['assumptions', schemeId] as const,
  list: (schemeId: string) => [...assumptionKeys.all(schemeId), 'list'] as const,
  detail: (schemeId: string, id: string) => [...assumptionKeys.all(schemeId), 'detail', id] as const,
  compare: (schemeId: string, a: string, b: string) => [...assumptionKeys.all(schemeId), 'compare', a, b] as const,
};

function useSchemeId() {
  return useCurrentScheme().scheme?.id ?? '';
}

export function useAssumptionSets() {
  const schemeId = useSchemeId();
  return useQuery({
    queryKey: assumptionKeys.list(schemeId),
    queryFn: () => api<{ sets: AssumptionSetSummary[] }>(`/schemes/${schemeId}/assumption-sets`).then((r) => r.sets),
    enabled: !!schemeId,
  });
}

export function useAssumptionSet(id: string | undefined) {
  const schemeId = useSchemeId();
  return useQuery({
    queryKey: assumptionKeys.detail(schemeId, id ?? ''),
    queryFn: () => api<AssumptionSet>(`/schemes/${schemeId}/assumption-sets/${id}`),
    enabled: !!schemeId && !!id,
  });
}

export function useCompareSets(a: string | undefined, b: string | undefined) {
  const schemeId = useSchemeId();
  return useQuery({
    queryKey: assumptionKeys.compare(schemeId, a ?? '', b ?? ''),
    queryFn: () => api<SetComparison>(`/schemes/${schemeId}/assumption-sets/${a}/compare/${b}`),
    enabled: !!schemeId && !!a && !!b && a !== b,
  });
}

function useInvalidate() {
  const schemeId = useSchemeId();
  const qc = useQueryClient();
  return () => qc.invalidateQueries({ queryKey: assumptionKeys.all(schemeId) });
}

/** Saves a draft's content (PUT), or creates a new draft when no id is given. */
export function useSaveDraft() {
  const schemeId = useSchemeId();
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ id, content }: { id?: string; content: AssumptionContent }) =>
      id ? api<AssumptionSet>(`/schemes/${schemeId}/assumption-sets/${id}`, { method: 'PUT', body: content }) : api<AssumptionSet>(`/schemes/${schemeId}/assumption-sets`, { body: content }),
    onSuccess: invalidate,
  });
}

/** Starts a new draft copied from an existing version. */
export function useNewDraft() {
  const schemeId = useSchemeId();
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: (fromId: string) => api<AssumptionSet>(`/schemes/${schemeId}/assumption-sets/${fromId}/drafts`, { method: 'POST' }),
    onSuccess: invalidate,
  });
}

export function useDiscardDraft() {
  const schemeId = useSchemeId();
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: (id: string) => api<{ ok: true }>(`/schemes/${schemeId}/assumption-sets/${id}`, { method: 'DELETE' }), onSuccess: invalidate });
}

export function useApproveSet() {
  const schemeId = useSchemeId();
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: (id: string) => api<AssumptionSet>(`/schemes/${schemeId}/assumption-sets/${id}/approve`, { method: 'POST' }), onSuccess: invalidate });
}

/** Uploads a price history and returns suggestions (nothing is stored). */
export function useHistorySuggestion() {
  const schemeId = useSchemeId();
  return useMutation({ mutationFn: (file: PickedFile) => api<HistorySuggestion>(`/schemes/${schemeId}/assumption-sets/history`, { form: fileForm(file) }) });
}

/** The editable content of a set, as the API takes it. */
export function contentOf(set: AssumptionSet): AssumptionContent {
  return {
    setAt: set.setAt,
    rationale: set.rationale,
    inflation: set.inflation,
    salaryGrowth: set.salaryGrowth,
    annuityRealRate: set.annuityRealRate,
    annuityYears: set.annuityYears,
    funds: set.funds.map(({ fundId, expectedReturn, volatility, annualCharge }) => ({ fundId, expectedReturn, volatility, annualCharge })),
    correlations: set.correlations.map((r) => r.slice()),
  };
}

/**
 * A draft's content with suggested figures adopted: annual return and volatility for the chosen
 * funds (funds new to the set join with no charge) and, if asked, the correlations between them.
 */
export function mergeSuggestion(set: AssumptionSet, s: HistorySuggestion, fundIds: string[], adoptCorrelations: boolean): AssumptionContent {
  const c = contentOf(set);
  const round = (x: number) => Number(x.toFixed(6));
  for (const fid of fundIds) {
    const sf = s.funds.find((f) => f.fundId === fid);
    if (!sf) continue;
    const at = c.funds.findIndex((f) => f.fundId === fid);
    if (at >= 0) c.funds[at] = { ...c.funds[at], expectedReturn: round(sf.annualReturn), volatility: round(sf.annualVolatility) };
    else {
      c.funds.push({ fundId: fid, expectedReturn: round(sf.annualReturn), volatility: round(sf.annualVolatility), annualCharge: 0 });
      c.correlations = c.correlations.map((r) => [...r, 0]);
      c.correlations.push([...new Array<number>(c.funds.length - 1).fill(0), 1]);
    }
  }
  if (adoptCorrelations) {
    const idx = (fid: string) => c.funds.findIndex((f) => f.fundId === fid);
    s.funds.forEach((a, i) =>
      s.funds.forEach((b, j) => {
        if (i === j || !fundIds.includes(a.fundId) || !fundIds.includes(b.fundId)) return;
        c.correlations[idx(a.fundId)][idx(b.fundId)] = s.correlations[i][j];
      }),
    );
  }
  return c;
}

/**
 * Adopts suggestions into a draft: the given draft, or a new one copied from `fromId`.
 * Returns the saved draft.
 */
export function useAdoptSuggestion() {
  const schemeId = useSchemeId();
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: async ({ draftId, fromId, suggestion, fundIds, correlations }: { draftId?: string; fromId?: string; suggestion: HistorySuggestion; fundIds: string[]; correlations: boolean }) => {
      const target = draftId
        ? await api<AssumptionSet>(`/schemes/${schemeId}/assumption-sets/${draftId}`)
        : await api<AssumptionSet>(`/schemes/${schemeId}/assumption-sets/${fromId}/drafts`, { method: 'POST' });
      const content = mergeSuggestion(target, suggestion, fundIds, correlations);
      return api<AssumptionSet>(`/schemes/${schemeId}/assumption-sets/${target.id}`, { method: 'PUT', body: content });
    },
    onSettled: invalidate,
  });
}
