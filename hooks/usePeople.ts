import { useInfiniteQuery, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Role } from '@/constants/permissions';
import type { Wire } from '@/types/wire';
import type { activity } from '@/server/services/activity';
import type { invite, issueReset, listPeople } from '@/server/services/people';
import { api } from './api';

/** The people routes answer with what server/services/people.ts returns (dates as ISO strings). */
type PeopleList = Wire<Awaited<ReturnType<typeof listPeople>>>;
export type Person = PeopleList['people'][number];
export type PendingInvitation = PeopleList['pending'][number];
/** An audit event as the activity screen reads it: the sentence, details and link, beside the recorded values. */
type ActivityPage = Wire<Awaited<ReturnType<typeof activity>>>;
export type AuditEvent = ActivityPage['events'][number];

export const peopleKeys = {
  all: (schemeId: string) => ['schemes', schemeId, 'people'] as const,
  activity: (schemeId: string) => ['schemes', schemeId, 'activity'] as const,
};

export function usePeople(schemeId: string | undefined) {
  return useQuery({
    queryKey: peopleKeys.all(schemeId ?? ''),
    queryFn: () => api<PeopleList>(`/schemes/${schemeId}/people`),
    enabled: !!schemeId,
  });
}

/** What the server answers for a sent invitation: where it went, never its link. */
export type InvitationSent = Wire<Awaited<ReturnType<typeof invite>>>;

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
  return useMutation({ mutationFn: (userId: string) => api<Wire<Awaited<ReturnType<typeof issueReset>>>>(`/schemes/${schemeId}/people/${userId}/reset-link`, { method: 'POST', body: {} }) });
}

export function useActivity(schemeId: string | undefined) {
  return useInfiniteQuery({
    queryKey: peopleKeys.activity(schemeId ?? ''),
    enabled: !!schemeId,
    initialPageParam: null as number | null,
    queryFn: ({ pageParam }) => api<ActivityPage>(`/schemes/${schemeId}/activity?limit=50${pageParam ? `&before=${pageParam}` : ''}`),
    getNextPageParam: (last) => last.next,
  });
}
