import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Wire } from '@/types/wire';
import type { listOutbox, retryMessage } from '@/server/services/mail';
import { api } from './api';

export type OutboxMessage = Wire<Awaited<ReturnType<typeof listOutbox>>[number]>;
export type RetriedMessage = Wire<Awaited<ReturnType<typeof retryMessage>>>;

export const outboxKeys = { list: (schemeId: string) => ['schemes', schemeId, 'outbox'] as const };

/** The outbox, polled every few seconds while something is still on its way. */
export function useOutbox(schemeId: string | undefined) {
  return useQuery({
    queryKey: outboxKeys.list(schemeId ?? ''),
    queryFn: () => api<{ messages: OutboxMessage[] }>(`/schemes/${schemeId}/outbox`),
    enabled: !!schemeId,
    refetchInterval: (q) => (q.state.data?.messages.some((m) => m.status === 'queued' || m.status === 'retrying') ? 3000 : false),
  });
}

export function useRetryMessage(schemeId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api<RetriedMessage>(`/schemes/${schemeId}/outbox/${id}/retry`, { method: 'POST', body: {} }),
    onSuccess: () => qc.invalidateQueries({ queryKey: outboxKeys.list(schemeId) }),
  });
}
