import type { Places } from '@steadyhand/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';

/** GET /api/places: the facility's active units (with rooms and beds) for the location picker. */
export const placesQueryOptions = queryOptions({
  queryKey: ['places'],
  queryFn: async () => (await api.get('/api/places')) as Places,
  // Places change rarely; a code must not wait for them.
  staleTime: 10 * 60 * 1000,
  retry: 1,
});

export function usePlaces() {
  return useQuery(placesQueryOptions);
}
