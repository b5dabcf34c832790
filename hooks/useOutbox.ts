import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from './api';

export type OutboxMessage = {
  id: string;
  kind: string;
  recipients: string[];
  subject: string;
  body: string;
  status: 'queued' | 'retrying' | 'sent' | 'failed';
  attempts: number;
  lastError: string | null;
  createdAt: string;
  lastAttemptAt: string | null;
  sentAt: string | null;
  attachments: { id: string; filename: string; contentType: string; size: number }[];
};

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
    mutationFn: (id: string) => api<{ id: string; status: string }>(`/schemes/${schemeId}/outbox/${id}/retry`, { method: 'POST', body: {} }),
    onSuccess: () => qc.invalidateQueries({ queryKey: outboxKeys.list(schemeId) }),
  });
}
