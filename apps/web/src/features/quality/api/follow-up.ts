import type {
  FollowUp,
  FollowUpListResponse,
  FollowUpRequest,
  QualityCodeDetail,
} from '@steadyhand/shared';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { qualityCodeQueryKey } from './get-quality-code';
import { toQueryString } from './get-quality-codes';

export const followUpListQueryKey = (unitId: string) => ['quality', 'follow-up', unitId] as const;

/** Ended codes still waiting for their follow-up, oldest arrest first. */
export function useFollowUpList(unitId: string) {
  return useQuery({
    queryKey: followUpListQueryKey(unitId),
    queryFn: async ({ signal }) =>
      (await api.get(
        `/api/quality/follow-up${toQueryString({ ...(unitId ? { unitId } : {}), pageSize: '200' })}`,
        { signal },
      )) as FollowUpListResponse,
  });
}

export function useSaveFollowUp(codeId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (body: FollowUpRequest) =>
      (
        (await api.put(`/api/quality/codes/${encodeURIComponent(codeId)}/follow-up`, body)) as {
          followUp: FollowUp;
        }
      ).followUp,
    onSuccess: (followUp) => {
      queryClient.setQueryData<QualityCodeDetail>(qualityCodeQueryKey(codeId), (old) =>
        old ? { ...old, followUp } : old,
      );
      // The waiting list and the rates read it.
      void queryClient.invalidateQueries({ queryKey: ['quality', 'follow-up'] });
      void queryClient.invalidateQueries({ queryKey: ['quality', 'stats'] });
    },
  });
}
