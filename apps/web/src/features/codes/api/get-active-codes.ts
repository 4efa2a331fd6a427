import { CODE_CATEGORIES, textSchema } from '@steadyhand/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';

// Only what the list shows; the full code comes from GET /api/codes/:id on the record page.
const codeListItemSchema = z.object({
  id: textSchema(),
  location: textSchema().nullish(),
  category: z.enum(CODE_CATEGORIES),
  arrestAt: textSchema(),
});
const codesResponseSchema = z.object({ codes: z.array(codeListItemSchema) });

export type CodeListItem = z.infer<typeof codeListItemSchema>;

export const activeCodesQueryKey = ['codes', 'list', { status: 'active' }] as const;

export async function getActiveCodes(): Promise<CodeListItem[]> {
  return codesResponseSchema.parse(await api.get('/api/codes?status=active')).codes;
}

export const activeCodesQueryOptions = () =>
  queryOptions({
    queryKey: activeCodesQueryKey,
    queryFn: getActiveCodes,
    staleTime: 5_000,
    // A code started on another tablet should appear here without a reload.
    refetchInterval: 15_000,
  });

export function useActiveCodes() {
  return useQuery(activeCodesQueryOptions());
}
