import type { QualityCodeDetail } from '@steadyhand/shared';
import { useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

export const qualityCodeQueryKey = (codeId: string) => ['quality', 'code', codeId] as const;

export function useQualityCode(codeId: string) {
  return useQuery({
    queryKey: qualityCodeQueryKey(codeId),
    queryFn: async ({ signal }) => (await api.get(`/api/quality/codes/${encodeURIComponent(codeId)}`, { signal })) as QualityCodeDetail,
  });
}
