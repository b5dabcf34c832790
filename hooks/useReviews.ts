import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Wire } from '@/types/wire';
import type { getReview, listReviews, ReviewPatch } from '@/server/services/reviews';
import { api } from './api';
import { overviewKeys } from './useOverview';

export type ReviewSummary = Wire<Awaited<ReturnType<typeof listReviews>>[number]>;
export type Review = Wire<Awaited<ReturnType<typeof getReview>>>;
export type { ReviewPatch };

export const reviewKeys = {
  all: (schemeId: string) => ['schemes', schemeId, 'reviews'] as const,
  list: (schemeId: string) => [...reviewKeys.all(schemeId), 'list'] as const,
  detail: (schemeId: string, id: string) => [...reviewKeys.all(schemeId), 'detail', id] as const,
};

/** The review's PDF decision record (kept as signed; a draft while open). */
export const recordHref = (schemeId: string, id: string) => `/api/schemes/${schemeId}/reviews/${id}/record.pdf`;

export function useReviews(schemeId: string | undefined) {
  return useQuery({ queryKey: reviewKeys.list(schemeId ?? ''), queryFn: () => api<{ reviews: ReviewSummary[] }>(`/schemes/${schemeId}/reviews`).then((r) => r.reviews), enabled: !!schemeId });
}

export function useReview(schemeId: string | undefined, id: string | undefined) {
  return useQuery({ queryKey: reviewKeys.detail(schemeId ?? '', id ?? ''), queryFn: () => api<Review>(`/schemes/${schemeId}/reviews/${id}`), enabled: !!schemeId && !!id });
}

function useReviewMutation<V>(schemeId: string | undefined, call: (v: V) => Promise<Review | { ok: true }>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: call,
    onSuccess: (data) => {
      if ('id' in data) qc.setQueryData(reviewKeys.detail(schemeId!, data.id), data);
      void qc.invalidateQueries({ queryKey: reviewKeys.list(schemeId!) });
      void qc.invalidateQueries({ queryKey: overviewKeys.scheme(schemeId!) });
      void qc.invalidateQueries({ queryKey: ['options', schemeId!] });
    },
  });
}

export function useOpenReview(schemeId: string | undefined) {
  return useReviewMutation(schemeId, (body: { title: string }) => api<Review>(`/schemes/${schemeId}/reviews`, { body }));
}

export function useUpdateReview(schemeId: string | undefined, id: string | undefined) {
  return useReviewMutation(schemeId, (patch: ReviewPatch) => api<Review>(`/schemes/${schemeId}/reviews/${id}`, { method: 'PATCH', body: patch }));
}

export function useSignReview(schemeId: string | undefined, id: string | undefined) {
  return useReviewMutation(schemeId, (sign: boolean) => api<Review>(`/schemes/${schemeId}/reviews/${id}/sign-off`, { method: sign ? 'POST' : 'DELETE' }));
}

export function useDiscardReview(schemeId: string | undefined, id: string | undefined) {
  return useReviewMutation(schemeId, () => api<{ ok: true }>(`/schemes/${schemeId}/reviews/${id}`, { method: 'DELETE' }));
}
