import { useMutation } from '@tanstack/react-query';
import { api, isApiError } from '../../../lib/api-client';

/** Signs out. A 401 means the session had already ended, which is what we wanted. */
export async function logout(): Promise<void> {
  try {
    await api.post('/api/auth/logout');
  } catch (error) {
    if (isApiError(error) && error.status === 401) return;
    throw error;
  }
}

export function useLogout() {
  return useMutation({ mutationFn: logout });
}
