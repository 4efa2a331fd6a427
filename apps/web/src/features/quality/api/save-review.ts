import type { QualityCodeDetail, QualityReview, QualityReviewRequest } from '@steadyhand/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { qualityCodeQueryKey } from './get-quality-code';

function useReviewMutation<T>(codeId: string, send: (input: T) => Promise<unknown>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (input: T) => ((await send(input)) as { review: QualityReview }).review,
    onSuccess: (review) => {
      queryClient.setQueryData<QualityCodeDetail>(qualityCodeQueryKey(codeId), (old) => (old ? { ...old, review } : old));
      // The list shows who signed off.
      void queryClient.invalidateQueries({ queryKey: ['quality', 'codes'] });
    },
  });
}

export function useSaveReview(codeId: string) {
  return useReviewMutation<QualityReviewRequest>(codeId, (body) => api.put(`/api/quality/codes/${encodeURIComponent(codeId)}/review`, body));
}

export function useSignReview(codeId: string) {
  return useReviewMutation<string>(codeId, (password) => api.post(`/api/quality/codes/${encodeURIComponent(codeId)}/review/sign`, { password }));
}
