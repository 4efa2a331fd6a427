import { meUserSchema, type MeUser } from '@steadyhand/shared';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { api, isApiError } from '../api-client';

const meResponseSchema = z.object({ user: meUserSchema });

export const meQueryKey = ['auth', 'me'] as const;

/** The signed-in user, or null when nobody is signed in (401 is an answer here, not an error). */
export async function getMe(): Promise<MeUser | null> {
  try {
    return meResponseSchema.parse(await api.get('/api/auth/me')).user;
  } catch (error) {
    if (isApiError(error) && error.status === 401) return null;
    throw error;
  }
}

export const meQueryOptions = () =>
  queryOptions({
    queryKey: meQueryKey,
    queryFn: getMe,
    staleTime: 5 * 60_000,
  });

export function useMe() {
  return useQuery(meQueryOptions());
}
