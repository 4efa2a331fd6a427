import type { ChangePasswordRequest, SessionInfo, TotpEnrolment, TotpStatus } from '@steadyhand/shared';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { meQueryKey } from '../../../lib/session/get-me';

// The server's answers are our own contract (shared types); they are not re-validated here.
const mySessionsKey = ['account', 'sessions'] as const;
const totpKey = ['account', 'totp'] as const;

export function useMySessions() {
  return useQuery({ queryKey: mySessionsKey, queryFn: async () => ((await api.get('/api/account/sessions')) as { sessions: SessionInfo[] }).sessions });
}

export function useEndMySession() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.delete(`/api/account/sessions/${encodeURIComponent(id)}`),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: mySessionsKey }),
  });
}

export function useChangePassword({ onSuccess }: { onSuccess?: () => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (body: ChangePasswordRequest) => api.post('/api/account/password', body),
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: meQueryKey });
      onSuccess?.();
    },
  });
}

export function useTotpStatus() {
  return useQuery({ queryKey: totpKey, queryFn: async () => (await api.get('/api/account/totp')) as TotpStatus });
}

export function useStartTotp() {
  return useMutation({ mutationFn: async () => (await api.post('/api/account/totp/start')) as TotpEnrolment });
}

export function useConfirmTotp() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (code: string) => ((await api.post('/api/account/totp/confirm', { code })) as { recoveryCodes: string[] }).recoveryCodes,
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: totpKey });
      await queryClient.invalidateQueries({ queryKey: meQueryKey });
    },
  });
}
