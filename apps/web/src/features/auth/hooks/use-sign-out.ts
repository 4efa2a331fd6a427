import { useQueryClient } from '@tanstack/react-query';
import { useCallback } from 'react';
import { useNavigate } from 'react-router';
import { paths } from '../../../config/paths';
import { useLogout } from '../api/logout';

export interface SignOutState {
  signOut: () => Promise<void>;
  isPending: boolean;
  /** Why the server refused (for example 409: entries still waiting to sync). */
  error: Error | null;
  dismissError: () => void;
}

export function useSignOut(): SignOutState {
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const { mutateAsync, isPending, error, reset } = useLogout();

  const signOut = useCallback(async () => {
    try {
      await mutateAsync();
    } catch {
      // The refusal stays in `error` for the page to show; the person stays signed in.
      return;
    }
    // Leave the signed-in area first, so its guard does not add a `next` to come back to.
    await navigate(paths.signIn.getHref(), { replace: true });
    queryClient.clear();
  }, [mutateAsync, navigate, queryClient]);

  return { signOut, isPending, error, dismissError: reset };
}
