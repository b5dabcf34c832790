import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Wire } from '@/types/wire';
import type { getOption, OptionInput, OptionSummary, VersionComparison as ServerComparison, VersionDetail, VersionSummary } from '@/server/services/options';
import type { currentDefaultOf } from '@/server/services/governance';
import { api } from './api';
import { useCurrentScheme } from './useCurrentScheme';
import { overviewKeys } from './useOverview';

export type GlidePathPoint = OptionInput['glidePath'][number];
export type { OptionInput };
export type DefaultOption = Wire<OptionSummary>;
export type OptionWithVersions = Wire<Awaited<ReturnType<typeof getOption>>>;
export type OptionVersionSummary = Wire<VersionSummary>;
export type OptionVersion = Wire<VersionDetail>;
export type VersionComparison = Wire<ServerComparison>;
export type CurrentDefault = Wire<Awaited<ReturnType<typeof currentDefaultOf>>>;

export const optionKeys = {
  all: (schemeId: string) => ['options', schemeId] as const,
  list: (schemeId: string, archived: boolean) => [...optionKeys.all(schemeId), 'list', archived] as const,
  detail: (schemeId: string, id: string) => [...optionKeys.all(schemeId), 'detail', id] as const,
  version: (schemeId: string, id: string, versionId: string) => [...optionKeys.all(schemeId), 'version', id, versionId] as const,
  compare: (schemeId: string, id: string, a: string, b: string) => [...optionKeys.all(schemeId), 'compare', id, a, b] as const,
};

function useSchemeId() {
  return useCurrentScheme().scheme?.id ?? '';
}

/** After a change, options, the overview (current default) and run choices read afresh. */
function useInvalidate() {
  const schemeId = useSchemeId();
  const qc = useQueryClient();
  return () => {
    void qc.invalidateQueries({ queryKey: optionKeys.all(schemeId) });
    void qc.invalidateQueries({ queryKey: overviewKeys.scheme(schemeId) });
    void qc.invalidateQueries({ queryKey: ['schemes', schemeId, 'runs', 'choices'] });
  };
}

export function useOptions(includeArchived = false) {
  const schemeId = useSchemeId();
  return useQuery({
    queryKey: optionKeys.list(schemeId, includeArchived),
    queryFn: () => api<{ options: DefaultOption[] }>(`/schemes/${schemeId}/options?archived=${includeArchived ? 1 : 0}`).then((r) => r.options),
    enabled: !!schemeId,
  });
}

export function useOption(id: string | undefined) {
  const schemeId = useSchemeId();
  return useQuery({ queryKey: optionKeys.detail(schemeId, id ?? ''), queryFn: () => api<OptionWithVersions>(`/schemes/${schemeId}/options/${id}`), enabled: !!schemeId && !!id });
}

export function useOptionVersion(optionId: string | undefined, versionId: string | undefined) {
  const schemeId = useSchemeId();
  return useQuery({
    queryKey: optionKeys.version(schemeId, optionId ?? '', versionId ?? ''),
    queryFn: () => api<OptionVersion>(`/schemes/${schemeId}/options/${optionId}/versions/${versionId}`),
    enabled: !!schemeId && !!optionId && !!versionId,
  });
}

export function useCompareVersions(optionId: string | undefined, a: string | undefined, b: string | undefined) {
  const schemeId = useSchemeId();
  return useQuery({
    queryKey: optionKeys.compare(schemeId, optionId ?? '', a ?? '', b ?? ''),
    queryFn: () => api<VersionComparison>(`/schemes/${schemeId}/options/${optionId}/versions/${a}/compare/${b}`),
    enabled: !!schemeId && !!optionId && !!a && !!b && a !== b,
  });
}

/** Creates an option (a draft version 1), or edits one: a pending draft changes, otherwise a new draft version starts. */
export function useSaveOption() {
  const schemeId = useSchemeId();
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ id, input }: { id?: string; input: OptionInput }) =>
      id ? api<OptionWithVersions>(`/schemes/${schemeId}/options/${id}`, { method: 'PUT', body: input }) : api<OptionWithVersions>(`/schemes/${schemeId}/options`, { body: input }),
    onSuccess: invalidate,
  });
}

export function useArchiveOption() {
  const schemeId = useSchemeId();
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ id, archived }: { id: string; archived: boolean }) => api<OptionWithVersions>(`/schemes/${schemeId}/options/${id}/archive`, { body: { archived } }),
    onSuccess: invalidate,
  });
}

export function useApproveVersion() {
  const schemeId = useSchemeId();
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ optionId, versionId }: { optionId: string; versionId: string }) => api<OptionVersion>(`/schemes/${schemeId}/options/${optionId}/versions/${versionId}/approve`, { method: 'POST' }),
    onSuccess: invalidate,
  });
}

export function useDiscardVersion() {
  const schemeId = useSchemeId();
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: ({ optionId, versionId }: { optionId: string; versionId: string }) => api<{ ok: true }>(`/schemes/${schemeId}/options/${optionId}/versions/${versionId}`, { method: 'DELETE' }),
    onSuccess: invalidate,
  });
}

/** Marks an option as the scheme's current default (the baseline of comparisons). */
export function useSetCurrentDefault() {
  const schemeId = useSchemeId();
  const invalidate = useInvalidate();
  return useMutation({
    mutationFn: (optionId: string | null) => api<{ currentDefault: CurrentDefault }>(`/schemes/${schemeId}/current-default`, { method: 'PUT', body: { optionId } }),
    onSuccess: invalidate,
  });
}
