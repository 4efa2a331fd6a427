import { CODE_CATEGORIES, textSchema } from '@steadyhand/shared';
import { queryOptions, useQuery, useQueryClient } from '@tanstack/react-query';
import { useEffect } from 'react';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { getLiveLink } from '../../../lib/live/live-socket';

const boardCodeSchema = z.object({
  id: textSchema(),
  location: textSchema().nullish(),
  category: z.enum(CODE_CATEGORIES),
  arrestAt: textSchema(),
});
const boardResponseSchema = z.object({ codes: z.array(boardCodeSchema) });

export type BoardCode = z.infer<typeof boardCodeSchema>;

export const boardCodesQueryKey = ['codes', 'board', { status: 'active' }] as const;

/** Live codes for the board: on the socket's `codes:changed`, and every 5 s in case an event was missed. */
export function useBoardCodes() {
  const queryClient = useQueryClient();
  useEffect(() => {
    const socket = getLiveLink().socket;
    const refresh = () => void queryClient.invalidateQueries({ queryKey: boardCodesQueryKey });
    socket.on('codes:changed', refresh);
    socket.on('connect', refresh);
    return () => {
      socket.off('codes:changed', refresh);
      socket.off('connect', refresh);
    };
  }, [queryClient]);
  return useQuery(
    queryOptions({
      queryKey: boardCodesQueryKey,
      queryFn: async () => boardResponseSchema.parse(await api.get('/api/codes?status=active')).codes,
      refetchInterval: 5_000,
      staleTime: 2_000,
    }),
  );
}
