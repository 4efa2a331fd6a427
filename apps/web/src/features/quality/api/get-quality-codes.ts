import type { QualityListQuery, QualityListResponse } from '@steadyhand/shared';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

/** Filters, sort and page as the list's URL holds them (strings; the server checks them). */
export type QualityListParams = Partial<Record<keyof QualityListQuery, string>>;

export function toQueryString(params: QualityListParams): string {
  const search = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v) search.set(k, v);
  const text = search.toString();
  return text ? `?${text}` : '';
}

export const qualityCodesQueryKey = (params: QualityListParams) => ['quality', 'codes', params] as const;

export function useQualityCodes(params: QualityListParams) {
  return useQuery({
    queryKey: qualityCodesQueryKey(params),
    queryFn: async ({ signal }) => (await api.get(`/api/quality/codes${toQueryString(params)}`, { signal })) as QualityListResponse,
    // Keep the old page on screen while the next one loads, so the table does not jump.
    placeholderData: keepPreviousData,
  });
}
