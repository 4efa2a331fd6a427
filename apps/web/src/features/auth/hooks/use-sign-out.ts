import { useQueryClient } from '@tanstack/react-query';
import { useCallback, useState } from 'react';
import { useNavigate } from 'react-router';
import { paths } from '../../../config/paths';
import { ApiError } from '../../../lib/api-client';
import { countOutbox } from '../../../lib/live/outbox';
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
  const [refusal, setRefusal] = useState<Error | null>(null);

  const signOut = useCallback(async () => {
    // Taps not yet on the server would be stranded on this device: refuse until they are saved.
    const waiting = await countOutbox().catch(() => 0);
    if (waiting > 0) {
      setRefusal(
        new ApiError(
          409,
          `${waiting} ${waiting === 1 ? 'entry is' : 'entries are'} still waiting to reach the server; stay signed in until they are saved.`,
        ),
      );
      return;
    }
    setRefusal(null);
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

  const dismissError = useCallback(() => {
    setRefusal(null);
    reset();
  }, [reset]);

  return { signOut, isPending, error: refusal ?? error, dismissError };
}
