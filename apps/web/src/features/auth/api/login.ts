import { publicUserSchema, type LoginRequest, type PublicUser } from '@steadyhand/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '../../../lib/api-client';
import { meQueryKey } from './get-me';

const loginResponseSchema = z.object({ user: publicUserSchema });

export async function login(input: LoginRequest): Promise<PublicUser> {
  return loginResponseSchema.parse(await api.post('/api/auth/login', input)).user;
}

export function useLogin({ onSuccess }: { onSuccess?: (user: PublicUser) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: login,
    onSuccess: (user) => {
      // A shared tablet may change hands: nothing cached for the last person may show to the next.
      queryClient.clear();
      queryClient.setQueryData(meQueryKey, user);
      onSuccess?.(user);
    },
  });
}
