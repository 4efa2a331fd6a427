import type { QualityStats } from '@steadyhand/shared';
import { useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { toQueryString, type QualityListParams } from './get-quality-codes';

export function useQualityStats(params: QualityListParams) {
  return useQuery({
    queryKey: ['quality', 'stats', params] as const,
    queryFn: async ({ signal }) => (await api.get(`/api/quality/stats${toQueryString(params)}`, { signal })) as QualityStats,
  });
}
