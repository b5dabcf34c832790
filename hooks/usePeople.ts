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

/** What the server answers for a sent invitation: where it went, never its link. */
export type InvitationSent = { id: string; email: string; role: Role; expiresAt: string; emailedTo: string };

export function useInvite(schemeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: { email: string; role: Role }) => api<InvitationSent>(`/schemes/${schemeId}/invitations`, { body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: peopleKeys.all(schemeId) }),
  });
}

/** Sends a waiting invitation again with a new link (the old one stops working). */
export function useResendInvitation(schemeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (invitationId: string) => api<InvitationSent>(`/schemes/${schemeId}/invitations/${invitationId}/resend`, { method: 'POST', body: {} }),
    onSuccess: () => qc.invalidateQueries({ queryKey: peopleKeys.all(schemeId) }),
  });
}

export function useCancelInvitation(schemeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (invitationId: string) => api<{ ok: true }>(`/schemes/${schemeId}/invitations/${invitationId}`, { method: 'DELETE' }),
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

/** E-mails the person a password-reset link and ends their sessions. */
export function useResetLink(schemeId: string) {
  return useMutation({ mutationFn: (userId: string) => api<{ emailedTo: string; expiresAt: string; sessionsEnded: number }>(`/schemes/${schemeId}/people/${userId}/reset-link`, { method: 'POST', body: {} }) });
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
