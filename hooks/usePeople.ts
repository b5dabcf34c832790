import { useInfiniteQuery, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Role } from '@/constants/permissions';
import type { Wire } from '@/types/wire';
import type { describeActivity } from '@/server/services/activity';
import { api } from './api';

export type Person = { id: string; email: string; displayName: string; role: Role; since: string; active: boolean };
export type PendingInvitation = { id: string; email: string; role: Role; expiresAt: string; createdAt: string };
/** An audit event as the activity screen reads it: the sentence, details and link, beside the recorded values. */
export type AuditEvent = Wire<Awaited<ReturnType<typeof describeActivity>>[number]>;

export const peopleKeys = {
  all: (schemeId: string) => ['schemes', schemeId, 'people'] as const,
  activity: (schemeId: string) => ['schemes', schemeId, 'activity'] as const,
};

export function usePeople(schemeId: string | undefined) {
  return useQuery({
    queryKey: peopleKeys.all(schemeId ?? ''),
    queryFn: () => api<{ people: Person[]; pending: PendingInvitation[] }>(`/schemes/${schemeId}/people`),
    enabled: !!schemeId,
  });
}

export function useInvite(schemeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; role: Role }) => api<{ email: string; role: Role; link: string; expiresAt: string }>(`/schemes/${schemeId}/invitations`, { body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: peopleKeys.all(schemeId) }),
  });
}

export function useChangeRole(schemeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ userId, role }: { userId: string; role: Role }) => api(`/schemes/${schemeId}/people/${userId}`, { method: 'PATCH', body: { role } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: peopleKeys.all(schemeId) }),
  });
}

export function useRemovePerson(schemeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (userId: string) => api(`/schemes/${schemeId}/people/${userId}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: peopleKeys.all(schemeId) }),
  });
}

export function useResetLink(schemeId: string) {
  return useMutation({ mutationFn: (userId: string) => api<{ link: string; expiresAt: string }>(`/schemes/${schemeId}/people/${userId}/reset-link`, { method: 'POST' }) });
}

export function useActivity(schemeId: string | undefined) {
  return useInfiniteQuery({
    queryKey: peopleKeys.activity(schemeId ?? ''),
    enabled: !!schemeId,
    initialPageParam: null as number | null,
    queryFn: ({ pageParam }) => api<{ events: AuditEvent[]; next: number | null }>(`/schemes/${schemeId}/activity?limit=50${pageParam ? `&before=${pageParam}` : ''}`),
    getNextPageParam: (last) => last.next,
  });
}
