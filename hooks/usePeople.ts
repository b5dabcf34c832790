import { useInfiniteQuery, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Role } from '@/constants/permissions';
import type { Wire } from '@/types/wire';
import type { accessTokens, auditEvents, users } from '@/db/schema';
import { api } from './api';

type UserRow = typeof users.$inferSelect;
type TokenRow = typeof accessTokens.$inferSelect;
type AuditRow = typeof auditEvents.$inferSelect;
/**
 * The people routes answer with columns of these tables (server/routes/people.ts selects them
 * inline; once those queries move into a service, derive from its return type instead).
 */
export type Person = Wire<Pick<UserRow, 'id' | 'email' | 'displayName'> & { role: Role; since: Date; active: boolean }>;
export type PendingInvitation = Wire<Pick<TokenRow, 'id' | 'email' | 'expiresAt' | 'createdAt'> & { role: Role }>;
export type AuditEvent = Wire<Pick<AuditRow, 'id' | 'at' | 'actorEmail' | 'action' | 'entity' | 'entityId' | 'before' | 'after'>>;

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
