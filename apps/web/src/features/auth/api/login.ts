import { loginResponseSchema, type LoginRequest, type LoginResponse, type PublicUser, type SecondFactorRequest } from '@steadyhand/shared';
import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { meQueryKey } from '../../../lib/session/get-me';

export async function login(input: LoginRequest): Promise<LoginResponse> {
  return loginResponseSchema.parse(await api.post('/api/auth/login', input));
}

const secondFactorResponseSchema = loginResponseSchema.pick({ user: true });

/** The second step of a sign-in (or a step-up for the admin pages): a code or a recovery code. */
export async function passSecondFactor(input: SecondFactorRequest): Promise<PublicUser> {
  return secondFactorResponseSchema.parse(await api.post('/api/auth/totp', input)).user;
}

function signedIn(queryClient: QueryClient, user: PublicUser) {
  // A shared tablet may change hands: nothing cached for the last person may show to the next.
  queryClient.clear();
  queryClient.setQueryData(meQueryKey, user);
  // The full answer (must change password, second factor) comes from /api/auth/me.
  void queryClient.invalidateQueries({ queryKey: meQueryKey });
}

export function useLogin({
  onSuccess,
  onSecondFactor,
}: { onSuccess?: (user: PublicUser) => void; onSecondFactor?: (user: PublicUser) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: login,
    onSuccess: ({ user, secondFactor }) => {
      if (secondFactor === 'required') {
        onSecondFactor?.(user);
        return;
      }
      signedIn(queryClient, user);
      onSuccess?.(user);
    },
  });
}

export function useSecondFactor({ onSuccess, keepCache = false }: { onSuccess?: (user: PublicUser) => void; keepCache?: boolean } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: passSecondFactor,
    onSuccess: async (user) => {
      if (keepCache) await queryClient.invalidateQueries({ queryKey: meQueryKey });
      else signedIn(queryClient, user);
      onSuccess?.(user);
    },
  });
}
